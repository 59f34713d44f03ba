export * from "./types.js";
export * from "./hypotheses.js";
export * from "./apply-change.js";
export * from "./diagnose.js";
