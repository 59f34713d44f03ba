export * from "./types.js";
export * from "./compare.js";
export * from "./audit-measurement.js";
export * from "./audit-records.js";
export * from "./run.js";
