export * from "./first-order.js";
export * from "./monte-carlo.js";
export * from "./random.js";
export * from "./statistics.js";
