/** drift/types: moved down to profile/driftTypes (render and drift both read them). */
export * from "../profile/driftTypes.js";
