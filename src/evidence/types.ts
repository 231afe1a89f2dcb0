/** evidence/types: moved down to profile/evidenceTypes (the profile layer owns the record's shapes). */
export * from "../profile/evidenceTypes.js";
