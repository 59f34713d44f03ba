export * from "./first-order.js";
export * from "./monte-carlo.js";
export * from "./monte-carlo-job.js";
export * from "./monte-carlo-pool.js";
export * from "./draw-stream.js";
export * from "./random.js";
export * from "./sample-summary.js";
export * from "./statistics.js";
