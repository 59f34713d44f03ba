/** A result or field name as words: "total_mass" → "total mass". */
export function plainName(name: string): string {
  return name.replace(/_/g, " ");
}
