import { describe, expect, it } from "vitest";
import katex from "katex";
import * as math from "mathjs";
import { UNITS, unitById } from "../../src/units/catalog.js";
import { ANGLE, DIMENSIONLESS, GRAVITATIONAL_PARAMETER, LENGTH, MASS, TIME, VELOCITY, dimension } from "../../src/units/dimension.js";
import { checkDimension, parseUnit, suggestions } from "../../src/units/parse.js";
import type { Unit } from "../../src/units/unit.js";
import type { Issue } from "../../src/problem.js";

function unitOf(text: string): Unit {
  const r = parseUnit(text);
  if (!r.ok) throw new Error(`${text}: ${r.issues.map((i) => i.message).join("; ")}`);
  return r.value;
}

function issuesOf(text: string): readonly Issue[] {
  const r = parseUnit(text);
  if (r.ok) throw new Error(`${text} parsed as ${r.value.id}`);
  return r.issues;
}

function renders(latex: string): boolean {
  return katex.renderToString(latex, { throwOnError: true, strict: "error", trust: false }).includes("katex");
}

describe("catalogue spellings", () => {
  it("every id and alias parses to its own catalogue unit", () => {
    for (const u of UNITS) {
      for (const name of [u.id, ...u.aliases]) expect(unitOf(name), name).toBe(u);
    }
  });

  it("trims and collapses whitespace before the exact lookup", () => {
    expect(unitOf("  km   s-1 ")).toBe(unitById("km/s"));
    expect(unitOf("solar\tmasses")).toBe(unitById("Msun"));
    expect(unitOf(" yr ")).toBe(unitById("yr"));
  });

  it.each([
    ["M_sun", "Msun"],
    ["M☉", "Msun"],
    ["µas", "uas"], // U+00B5 micro sign
    ["μas", "uas"], // U+03BC Greek small mu
    ["uas", "uas"],
    ["AU", "au"],
    ["au", "au"],
    ["", "1"],
  ])("%j is %s", (text, id) => {
    expect(unitOf(text).id).toBe(id);
  });

  it("is case-sensitive", () => {
    expect(parseUnit("Au").ok).toBe(false);
    expect(parseUnit("KM").ok).toBe(false);
    expect(parseUnit("MSUN").ok).toBe(false);
  });
});

describe("compound units", () => {
  it.each([
    ["km s^-1", "km/s"],
    ["km s-1", "km/s"],
    ["km/s", "km/s"],
    ["km s**-1", "km/s"],
    ["km·s⁻¹", "km/s"],
    ["km⋅s⁻¹", "km/s"],
    ["km*s^-1", "km/s"],
    ["km s^(-1)", "km/s"],
    ["s-1 km", "km/s"],
    ["m s**-1", "m/s"],
    ["m/s", "m/s"],
    ["m3 s-2", "m3/s2"],
    ["m^3/s^2", "m3/s2"],
    ["m³ s⁻²", "m3/s2"],
    ["km^3/s^2", "km3/s2"],
    ["km3/s2", "km3/s2"],
    ["km³/s²", "km3/s2"],
    ["km3/s^2", "km3/s2"],
    ["(km)", "km"],
    ["km^1", "km"],
    ["m/m", "1"],
  ])("%j is the catalogue unit %s", (text, id) => {
    expect(unitOf(text)).toBe(unitById(id));
  });

  it("builds an id, symbol and LaTeX for a product the catalogue lacks", () => {
    const u = unitOf("Msun/pc^3");
    expect(u.id).toBe("Msun pc-3");
    expect(u.symbol).toBe("M☉ pc⁻³");
    expect(u.aliases).toEqual([]);
    expect(u.definition).toBe("derived from Msun, pc");
    expect(u.dimension).toEqual(dimension({ mass: 1, length: -3 }));
    expect(renders(u.latex)).toBe(true);
    expect(u.source).toContain("IAU 2015 Resolution B3");
  });

  it("gives every spelling of one product the same id", () => {
    for (const text of ["Msun pc-3", "Msun/pc3", "M_sun pc^-3", "pc**-3 M☉", "M☉·pc⁻³"]) expect(unitOf(text).id, text).toBe("Msun pc-3");
    // and the generated id parses back to itself
    expect(unitOf("Msun pc-3").id).toBe("Msun pc-3");
  });

  it("merges repeated factors", () => {
    expect(unitOf("m m").id).toBe("m2");
    expect(unitOf("d d^-1 yr").id).toBe("yr");
    expect(unitOf("1/s").id).toBe("s-1");
  });

  it("accepts a bracketed divisor", () => {
    const u = unitOf("m3/(kg s2)");
    expect(u.id).toBe("m3 kg-1 s-2");
    expect(u.dimension).toEqual(dimension({ length: 3, mass: -1, time: -2 }));
    expect(unitOf("km/(s Mpc)").id).toBe("km s-1 Mpc-1");
  });

  // mathjs 15.2.0 (npm) as an outside reference for the size of products;
  // 4 ulp: a product of up to three rounded factors on each side.
  it.each([
    ["cm3 s-2", "cm^3/s^2"],
    ["d-1", "1/day"],
    ["km s-1 h-1", "km/s/hour"],
    ["deg yr-1", "deg/year"],
    ["g cm-3", "g/cm^3"],
    ["m2", "m^2"],
    ["arcsec2", "arcsec^2"],
  ])("%j has the size of mathjs %j", (text, reference) => {
    const u = unitOf(text);
    const theirs = math.unit(1, reference);
    const base = [
      u.dimension.length ? `m^${u.dimension.length}` : "",
      u.dimension.mass ? `kg^${u.dimension.mass}` : "",
      u.dimension.time ? `s^${u.dimension.time}` : "",
      u.dimension.angle ? `rad^${u.dimension.angle}` : "",
    ].filter(Boolean).join(" ");
    expect(theirs.equalBase(math.unit(base))).toBe(true);
    expect(Math.abs(u.scale - theirs.toNumber(base)) / u.scale).toBeLessThanOrEqual(4 * Number.EPSILON);
  });

  it("keeps powers of ten exact", () => {
    expect(unitOf("cm3 s-2").scale).toBe(1e-6);
    expect(unitOf("km2").scale).toBe(1e6);
    expect(unitOf("g cm-3").scale).toBe(1000);
  });

  it("gives a compound mass unit its GM", () => {
    const u = unitOf("Msun km m-1");
    expect(u.dimension).toEqual(MASS);
    expect(u.gm).toBe(1.3271244e20 * 1000);
    expect(u.gmRelativeUncertainty).toBe(0);
  });

  it("renders the LaTeX of awkward atoms (degrees, arcseconds) with powers", () => {
    expect(renders(unitOf("deg2").latex)).toBe(true);
    expect(renders(unitOf("arcsec2").latex)).toBe(true);
    expect(renders(unitOf("deg yr-1").latex)).toBe(true);
    expect(renders(unitOf("R_sun3 d-2").latex)).toBe(true);
  });
});

describe("unknown units", () => {
  it('suggests "au" or "AU" for "Au"', () => {
    const [i] = issuesOf("Au");
    expect(i.code).toBe("unknown-unit");
    expect(i.message).toBe('unknown unit "Au"');
    expect(i.hint).toBe('did you mean "au" or "AU"? Unit spelling is case-sensitive.');
  });

  it.each([
    ["Msum", ["Msun"]],
    ["kms", ["km", "km/s", "kmps"]],
    ["parsek", ["parsec"]],
    ["Km/s", ["km/s"]],
    ["Solar masses", ["solar masses"]],
    ["yrs", ["yr"]],
  ])("suggests the nearest spellings for %j", (text, expected) => {
    expect(suggestions(text)).toEqual(expected);
    const issues = issuesOf(text);
    expect(issues).toHaveLength(1);
    expect(issues[0].code).toBe("unknown-unit");
    for (const s of expected) expect(issues[0].hint).toContain(`"${s}"`);
  });

  it("suggests nothing for text far from every unit, and lists examples instead", () => {
    const [i] = issuesOf("furlong");
    expect(i.code).toBe("unknown-unit");
    expect(i.hint).toBe("write a unit such as s, d, yr, au, pc, mas, km/s, Msun");
    expect(suggestions("x")).toEqual([]);
  });

  it("names the unknown factor inside a compound, one issue per unknown factor", () => {
    const issues = issuesOf("furlong fortnight-1");
    expect(issues.map((i) => i.code)).toEqual(["unknown-unit", "unknown-unit"]);
    expect(issues[0].message).toBe('unknown unit "furlong" in "furlong fortnight-1"');
    expect(issues[1].message).toBe('unknown unit "fortnight" in "furlong fortnight-1"');
    const [one] = issuesOf("Msum/pc3");
    expect(one.message).toBe('unknown unit "Msum" in "Msum/pc3"');
    expect(one.hint).toContain('"Msun"');
  });
});

describe("malformed units", () => {
  it.each([
    ["m3/kg s2", "ambiguous-unit"],
    ["km/s/Mpc", "ambiguous-unit"],
    ["m^0", "bad-unit"],
    ["m^1.5", "bad-unit"],
    ["m^", "bad-unit"],
    ["m^99", "bad-unit"],
    ["(km s", "bad-unit"],
    ["km)", "bad-unit"],
    ["2 km", "bad-unit"],
    ["/s", "bad-unit"],
    ["((((((m))))))", "bad-unit"],
    ["Mpc^12 Mpc^12 Mpc^12", "bad-unit"],
  ])("%j is refused as %s", (text, code) => {
    const issues = issuesOf(text);
    expect(issues[0].code).toBe(code);
    expect(issues[0].hint?.length).toBeGreaterThan(0);
  });

  it("keeps the syntax problem but hints at the catalogue spelling of a near-miss", () => {
    const [i] = issuesOf("km//s");
    expect(i.code).toBe("bad-unit");
    expect(i.message).toBe('unexpected "/" in unit "km//s"');
    expect(i.hint).toBe('did you mean "km/s"?');
    const [j] = issuesOf("km)");
    expect(j.code).toBe("bad-unit");
    expect(j.hint).toBe('did you mean "km"?');
  });

  it("refuses overlong text without scanning it", () => {
    const [i] = issuesOf("m ".repeat(1000));
    expect(i.code).toBe("bad-unit");
  });

  it("returns the same frozen result for repeated text", () => {
    const a = parseUnit("Msun pc-3");
    const b = parseUnit("Msun pc-3");
    expect(a).toBe(b);
    expect(Object.isFrozen(a)).toBe(true);
  });
});

describe("checkDimension", () => {
  it("accepts a unit of the expected dimension", () => {
    expect(checkDimension(unitOf("d"), TIME, "period")).toBeUndefined();
    expect(checkDimension(unitOf("mas"), [LENGTH, ANGLE], "semi-major axis")).toBeUndefined();
    expect(checkDimension(unitOf("au"), [LENGTH, ANGLE], "semi-major axis")).toBeUndefined();
    expect(checkDimension(unitOf("km s-1"), VELOCITY, "semi-amplitude")).toBeUndefined();
    expect(checkDimension(unitOf(""), DIMENSIONLESS, "eccentricity")).toBeUndefined();
  });

  it("names the expected dimension with example units and the dimension given", () => {
    const i = checkDimension(unitOf("km"), TIME, "period")!;
    expect(i.code).toBe("wrong-dimension");
    expect(i.message).toBe('period needs a time unit (s, d, yr); "km" is a length');
    expect(i.hint).toBe("give period in one of: s, min, h, d, yr");
  });

  it("lists every accepted dimension", () => {
    const i = checkDimension(unitOf("km/s"), [LENGTH, ANGLE], "semi-major axis")!;
    expect(i.message).toBe('semi-major axis needs a length unit (km, au, pc) or an angle unit (deg, arcsec, mas); "km/s" is a velocity');
    expect(i.hint).toContain("mas");
    expect(i.hint).toContain("au");
  });

  it("says when a unit is missing and when one is given for a pure number", () => {
    expect(checkDimension(unitOf(""), TIME, "period")!.message).toBe("period needs a time unit (s, d, yr); there is no unit");
    const e = checkDimension(unitOf("deg"), DIMENSIONLESS, "eccentricity")!;
    expect(e.message).toBe('eccentricity needs a plain number without a unit; "deg" is an angle');
    expect(e.hint).toBe("write eccentricity as a plain number, without a unit");
  });

  it("describes dimensions without a name by their exponents", () => {
    const i = checkDimension(unitOf("m3 s-1"), GRAVITATIONAL_PARAMETER, "GM")!;
    expect(i.message).toBe('GM needs a gravitational parameter (GM) unit (m3/s2, km3/s2); "m3 s-1" is a length³·time⁻¹');
  });
});
