export * from "./types.js";
export * from "./weighted-average.js";
export * from "./combine-object.js";
