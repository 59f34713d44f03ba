export * from "./types.js";
export * from "./compare-releases.js";
export * from "./read-audit-json.js";
