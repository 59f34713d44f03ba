export * from "./quantity.js";
export * from "./parse.js";
export * from "./format.js";
