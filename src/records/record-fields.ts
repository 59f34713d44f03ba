/** The fields a record may have at each level; anything else is reported with the closest of these. */
export const OBJECT_FIELDS = ["name", "id", "aliases", "notes", "measurements"] as const;
export const MEASUREMENT_FIELDS = ["key", "method", "reference", "inputs", "published", "use", "comment"] as const;
export const REFERENCE_FIELDS = ["cite", "doi", "bibcode", "url", "locator"] as const;
