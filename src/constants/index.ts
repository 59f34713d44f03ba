export * from "./constant.js";
export * as codata2018 from "./codata2018.js";
export * as codata2014 from "./codata2014.js";
export * as iau2012 from "./iau2012.js";
export * as iau2015 from "./iau2015.js";
export * as derived from "./derived.js";
export * from "./sets.js";
