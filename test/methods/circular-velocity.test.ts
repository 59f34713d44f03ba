import { describe, expect, it } from "vitest";
import { circularVelocity as m } from "../../src/methods/circular-velocity.js";
import { relativeOrbit } from "../../src/methods/relative-orbit.js";
import { codes, relErr } from "./helpers.js";
import { si } from "./sample-inputs.js";

describe("circular-velocity: validation", () => {
  it("accepts a speed with a radius", () => {
    expect(m.validate({ velocity: si(229, "km/s"), radius: si(8.1, "kpc") })).toEqual([]);
  });

  it("asks for the speed and the radius", () => {
    expect(codes(m.validate({}))).toEqual(["missing-input@velocity", "missing-input@radius"]);
  });

  it("needs a parallax or a distance for an angular radius, and not both", () => {
    expect(codes(m.validate({ velocity: 1, angular_radius: 1e-8 }))).toEqual(["needs-parallax-or-distance@radius"]);
    expect(codes(m.validate({ velocity: 1, angular_radius: 1e-8, parallax: 1e-7, distance: 1e18 }))).toEqual(["ambiguous-input@distance"]);
  });

  it("refuses a non-positive speed or radius", () => {
    expect(codes(m.validate({ velocity: 0, radius: -1 }))).toEqual(["out-of-range@velocity", "out-of-range@radius"]);
  });
});

describe("circular-velocity: compute", () => {
  it("is v²r", () => {
    expect(m.compute({ velocity: 3, radius: 7 }).enclosed_mass).toBe(63);
  });

  it("gives the same mass from 1″ at 10 pc, from ϖ = 0.1″, and from 10 au", () => {
    const v = si(10, "km/s");
    const linear = m.compute({ velocity: v, radius: si(10, "au") }).enclosed_mass;
    expect(relErr(m.compute({ velocity: v, angular_radius: si(1, "arcsec"), distance: si(10, "pc") }).enclosed_mass, linear)).toBeLessThan(1e-14);
    expect(relErr(m.compute({ velocity: v, angular_radius: si(1, "arcsec"), parallax: si(0.1, "arcsec") }).enclosed_mass, linear)).toBeLessThan(1e-14);
  });

  it("agrees with Kepler's third law for a circular orbit, v = 2πa/P", () => {
    const a = si(5.2, "au");
    const P = si(11.86, "yr");
    const v = (2 * Math.PI * a) / P;
    const kepler = relativeOrbit.compute({ period: P, semimajor_axis: a }).total_mass;
    expect(relErr(m.compute({ velocity: v, radius: a }).enclosed_mass, kepler)).toBeLessThan(1e-14);
  });

  it("states how an angular radius became a length", () => {
    expect(m.implicitAssumptions({ velocity: 1, angular_radius: 1e-8, distance: 1e22 })).toEqual([
      "radius = angle × distance (small-angle approximation)",
    ]);
  });
});
