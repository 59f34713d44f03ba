import type { SIInputs } from "../../src/methods/method.js";
import { unitById } from "../../src/units/catalog.js";

/**
 * Valid SI input sets for every method, one per combination of optional
 * inputs (masses as GM). Values are invented but of realistic size, so that
 * the checks run where records will put the methods to work.
 */

/** A value in a catalogue unit, in SI (GM for masses). */
export function si(value: number, unitId: string): number {
  const u = unitById(unitId);
  return value * (u.gm ?? u.scale);
}

export interface Sample {
  readonly label: string;
  readonly inputs: SIInputs;
}

export const SAMPLES: Readonly<Record<string, readonly Sample[]>> = {
  "relative-orbit": [
    { label: "linear a", inputs: { period: si(12.4, "yr"), semimajor_axis: si(6.1, "au") } },
    { label: "linear a, eccentric, parallax unused", inputs: { period: si(12.4, "yr"), semimajor_axis: si(6.1, "au"), eccentricity: 0.43, parallax: si(21.5, "mas") } },
    { label: "linear a, distance unused, primary mass", inputs: { period: si(3.2, "d"), semimajor_axis: si(0.052, "au"), distance: si(40, "pc"), primary_mass: si(1.05, "Msun") } },
    { label: "angular a with parallax, mass ratio, eccentric", inputs: { period: si(33.7, "yr"), angular_semimajor_axis: si(0.412, "arcsec"), parallax: si(38.9, "mas"), mass_ratio: 0.62, eccentricity: 0.71 } },
    { label: "angular a with distance, primary mass", inputs: { period: si(33.7, "yr"), angular_semimajor_axis: si(412, "mas"), distance: si(25.7, "pc"), primary_mass: si(0.6, "Msun") } },
    { label: "linear a, secondary mass", inputs: { period: si(8.1, "d"), semimajor_axis: si(31000, "km"), secondary_mass: si(0.0005, "Mearth") } },
    { label: "dark central mass, angular a with distance", inputs: { period: si(9.8, "yr"), angular_semimajor_axis: si(88, "mas"), distance: si(7.9, "kpc"), eccentricity: 0.9 } },
  ],
  "astrometric-orbit": [
    { label: "linear a1", inputs: { period: si(4.7, "yr"), semimajor_axis: si(0.0041, "au") } },
    { label: "angular a1 with parallax, primary mass (planet)", inputs: { period: si(61.5, "d"), angular_semimajor_axis: si(0.31, "mas"), parallax: si(180.2, "mas"), primary_mass: si(0.35, "Msun") } },
    { label: "angular a1 with distance, primary mass, eccentric", inputs: { period: si(2.2, "yr"), angular_semimajor_axis: si(2.9, "mas"), distance: si(480, "pc"), primary_mass: si(0.9, "Msun"), eccentricity: 0.45 } },
    { label: "linear a1, primary mass, heavy dark companion", inputs: { period: si(11.2, "yr"), semimajor_axis: si(16.0, "au"), primary_mass: si(0.8, "Msun") } },
    { label: "linear a1, parallax unused", inputs: { period: si(4.7, "yr"), semimajor_axis: si(0.0041, "au"), parallax: si(50, "mas") } },
  ],
  "single-lined": [
    { label: "period and K only", inputs: { period: si(5.3, "d"), k1: si(47, "m/s") } },
    { label: "eccentric", inputs: { period: si(5.3, "d"), k1: si(47, "m/s"), eccentricity: 0.27 } },
    { label: "primary mass, circular (planet)", inputs: { period: si(5.3, "d"), k1: si(47, "m/s"), primary_mass: si(0.96, "Msun") } },
    { label: "primary mass, inclination, eccentric", inputs: { period: si(3.9, "d"), k1: si(118, "m/s"), primary_mass: si(1.2, "Msun"), inclination: si(85.2, "deg"), eccentricity: 0.05 } },
    { label: "inclination without primary mass", inputs: { period: si(3.9, "d"), k1: si(118, "m/s"), inclination: si(85.2, "deg") } },
    { label: "dark heavy companion, retrograde inclination", inputs: { period: si(0.41, "d"), k1: si(402, "km/s"), primary_mass: si(0.55, "Msun"), inclination: si(118, "deg") } },
    { label: "stellar companion, eccentric, zero eccentricity given", inputs: { period: si(210, "d"), k1: si(21.4, "km/s"), primary_mass: si(2.1, "Msun"), eccentricity: 0 } },
  ],
  "double-lined": [
    { label: "period and both K", inputs: { period: si(7.4, "d"), k1: si(88.2, "km/s"), k2: si(97.5, "km/s") } },
    { label: "eccentric", inputs: { period: si(7.4, "d"), k1: si(88.2, "km/s"), k2: si(97.5, "km/s"), eccentricity: 0.21 } },
    { label: "eclipsing, circular", inputs: { period: si(2.73, "d"), k1: si(120.4, "km/s"), k2: si(131.9, "km/s"), inclination: si(86.9, "deg") } },
    { label: "eccentric, inclination above 90°", inputs: { period: si(104, "d"), k1: si(25.9, "km/s"), k2: si(26.9, "km/s"), eccentricity: 0.002, inclination: si(137.2, "deg") } },
  ],
  "circular-velocity": [
    { label: "linear radius", inputs: { velocity: si(231, "km/s"), radius: si(8.2, "kpc") } },
    { label: "angular radius with distance", inputs: { velocity: si(1030, "km/s"), angular_radius: si(4.1, "mas"), distance: si(7.4, "Mpc") } },
    { label: "angular radius with parallax", inputs: { velocity: si(4.6, "km/s"), angular_radius: si(0.6, "arcsec"), parallax: si(16.9, "mas") } },
    { label: "linear radius, parallax unused", inputs: { velocity: si(29.8, "km/s"), radius: si(1, "au"), parallax: si(100, "mas") } },
  ],
};
