export * from "./dimension.js";
export * from "./unit.js";
export * from "./catalog.js";
export * from "./parse.js";
