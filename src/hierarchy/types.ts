/** hierarchy/types: moved down to profile/hierarchyTypes (the profile layer owns the record's shapes). */
export * from "../profile/hierarchyTypes.js";
