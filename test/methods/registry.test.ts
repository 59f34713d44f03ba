import { describe, expect, it } from "vitest";
import { METHODS, METHOD_IDS, getMethod } from "../../src/methods/index.js";

describe("method registry", () => {
  it("holds the five methods under their record names", () => {
    expect(METHOD_IDS).toEqual(["relative-orbit", "astrometric-orbit", "single-lined", "double-lined", "circular-velocity"]);
  });

  it("finds each method by id and nothing for an unknown one", () => {
    for (const m of METHODS) expect(getMethod(m.id)).toBe(m);
    expect(getMethod("visual-binary")).toBeUndefined();
    expect(getMethod("")).toBeUndefined();
  });

  it("freezes the definitions and the list", () => {
    expect(Object.isFrozen(METHODS)).toBe(true);
    for (const m of METHODS) expect(Object.isFrozen(m)).toBe(true);
  });

  it("uses kebab-case ids and snake_case slot and result names", () => {
    for (const m of METHODS) {
      expect(m.id).toMatch(/^[a-z]+(-[a-z]+)*$/);
      for (const i of m.inputs) expect(i.slot).toMatch(/^[a-z0-9]+(_[a-z0-9]+)*$/);
      for (const r of m.results) expect(r.name).toMatch(/^[a-z0-9]+(_[a-z0-9]+)*$/);
    }
  });

  it("lists au among the constants of every method that turns a parallax into a distance", () => {
    for (const m of METHODS) {
      const parallax = m.inputs.some((i) => i.slot === "parallax");
      expect(m.constants.includes("au"), m.id).toBe(parallax);
    }
  });
});
