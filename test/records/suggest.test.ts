import { describe, expect, it } from "vitest";
import { closest, didYouMean, editDistance } from "../../src/records/suggest.js";

describe("editDistance", () => {
  // Textbook values (from memory): kitten → sitting needs 3 edits; with adjacent
  // transpositions counted once, "ca" → "ac" is 1; the restricted (optimal string
  // alignment) distance of "ca" → "abc" is 3, where full Damerau–Levenshtein gives 2.
  it("matches textbook values", () => {
    expect(editDistance("kitten", "sitting")).toBe(3);
    expect(editDistance("ca", "ac")).toBe(1);
    expect(editDistance("ca", "abc")).toBe(3);
    expect(editDistance("", "abc")).toBe(3);
    expect(editDistance("period", "period")).toBe(0);
    expect(editDistance("perod", "period")).toBe(1);
  });
  it("is symmetric", () => {
    expect(editDistance("parallax", "paralax")).toBe(editDistance("paralax", "parallax"));
  });
});

describe("closest", () => {
  const fields = ["period", "parallax", "semimajor_axis", "eccentricity", "inclination"];
  it("suggests near misses", () => {
    expect(closest("perod", fields)).toBe("period");
    expect(closest("paralax", fields)).toBe("parallax");
    expect(closest("semimajor-axis", fields)).toBe("semimajor_axis");
    expect(closest("Inclination", fields)).toBe("inclination");
  });
  it("suggests nothing for far-off words", () => {
    expect(closest("colour", fields)).toBeUndefined();
    expect(closest("x", fields)).toBeUndefined();
    expect(closest("perod", [])).toBeUndefined();
  });
  it("phrases the suggestion", () => {
    expect(didYouMean("perod", fields)).toBe("; did you mean 'period'?");
    expect(didYouMean("zzz", fields)).toBe("");
  });
});
