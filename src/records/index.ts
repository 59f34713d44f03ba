export { loadRecords, loadRecordText, DEFAULT_MAX_FILE_BYTES, type LoadOptions, type TextOutcome } from "./load.js";
export { isSlug, slugify, SLUG_PATTERN, SLUG_MAX_LENGTH } from "./slug.js";
export { compareProblems } from "./problem-list.js";
export type { LoadOutcome, MeasurementRecord, ObjectRecord, PublishedValue, SlotInput, Location } from "./types.js";
