// Writes an invented catalogue of YAML records for the benchmark: one file per
// object, 1000 files to a folder, every mass method represented, most published
// values honest (computed here from the rounded inputs with the same formulas),
// a few deliberately off so that every status occurs.
//
// Self-contained on purpose: it uses its own formulas and constants, not the
// compiled project, so a catalogue can be made before anything is compiled and
// the audit of it is a check of the project against an independent computation.
//
//   node bench/generate.mjs DIR COUNT [SEED]
//
// The objects and their numbers are made up; designations start with "BNCH".
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

// ---------------------------------------------------------------------------
// Constants (SI)

/** IAU 2012 Resolution B2: the astronomical unit, exact. */
const AU = 149597870700;
/** IAU 2015 Resolution B2: the parsec, 648000/π au, exact. */
const PC = (648000 / Math.PI) * AU;
/** IAU 2015 Resolution B3 nominal mass parameters (m³ s⁻²), exact by definition (Prša et al. 2016, AJ 152, 41, Table 1). */
const GM_SUN = 1.3271244e20;
const GM_JUP = 1.2668653e17;
const GM_EARTH = 3.986004e14;
/** IAU 2015 Resolution B3 nominal solar radius (m). */
const R_SUN = 6.957e8;
/** CODATA 2018 Newtonian constant of gravitation (m³ kg⁻¹ s⁻²). */
const G = 6.6743e-11;
const DAY = 86400;
/** Julian year, 365.25 d. */
const YEAR = 365.25 * DAY;
const ARCSEC = Math.PI / 648000;
const TWO_PI = 2 * Math.PI;
const FOUR_PI2 = 4 * Math.PI * Math.PI;

/** SI factor of each unit the catalogue writes; masses in GM form (m³ s⁻²). */
const UNIT_SI = Object.freeze({
  "1": 1,
  yr: YEAR,
  d: DAY,
  arcsec: ARCSEC,
  mas: ARCSEC / 1000,
  km: 1e3,
  au: AU,
  pc: PC,
  kpc: 1e3 * PC,
  Mpc: 1e6 * PC,
  "km/s": 1e3,
  "m/s": 1,
  deg: Math.PI / 180,
  R_sun: R_SUN,
  Msun: GM_SUN,
  Mjup: GM_JUP,
  Mearth: GM_EARTH,
  kg: G,
});

/** Files per subfolder. */
export const FILES_PER_FOLDER = 1000;

/** Shares of deliberately wrong or missing published values, per measurement. */
export const SLIP_RATES = Object.freeze({ tension: 0.03, discrepant: 0.03, notCompared: 0.04 });

// ---------------------------------------------------------------------------
// Seeded generator: mulberry32 over a 32-bit state, with an FNV-1a hash to
// derive one independent stream per object, so object n is the same whatever
// the count.

function hash32(text) {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

export function makeRandom(seedText) {
  let a = hash32(String(seedText));
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare;
  const rng = {
    next,
    uniform: (lo, hi) => lo + (hi - lo) * next(),
    logUniform: (lo, hi) => Math.exp(Math.log(lo) + (Math.log(hi) - Math.log(lo)) * next()),
    int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)),
    chance: (p) => next() < p,
    pick: (list) => list[Math.floor(next() * list.length)],
    /** Standard normal deviate (Box-Muller). */
    normal: () => {
      if (spare !== undefined) {
        const s = spare;
        spare = undefined;
        return s;
      }
      let u = 0;
      while (u === 0) u = next();
      const v = next();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(TWO_PI * v);
      return r * Math.cos(TWO_PI * v);
    },
  };
  return rng;
}

// ---------------------------------------------------------------------------
// Physics: the published relations, written out here on their own

/** Kepler's third law: GM from a (m) and P (s). */
const keplerGM = (a, P) => (FOUR_PI2 * a ** 3) / (P * P);
/** Kepler's third law: a (m) from GM and P (s). */
const keplerA = (GM, P) => Math.cbrt((GM * P * P) / FOUR_PI2);

/** The m > 0 with (m sin i)³ = f (M₁ + m)², by bracketing and bisection (GM form throughout). */
function companionMass(f, m1, sinI) {
  const s3 = sinI ** 3;
  const g = (m) => s3 * m ** 3 - f * (m1 + m) ** 2;
  let hi = f / s3 + m1 + 1;
  while (g(hi) < 0) hi *= 2;
  let lo = 0;
  for (let n = 0; n < 200 && hi - lo > 1e-15 * hi; n++) {
    const mid = 0.5 * (lo + hi);
    if (g(mid) < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Spectroscopic mass function f = P K³ (1 − e²)^{3/2} / 2π (GM form). */
const massFunctionSB = (P, K, e) => (P * K ** 3 * (1 - e * e) ** 1.5) / TWO_PI;

/** K₁ of a star of mass M₁ with a companion M₂ (GM form), at inclination sin i. */
function semiAmplitude(m1, m2, P, e, sinI) {
  const a = keplerA(m1 + m2, P);
  const a1 = (a * m2) / (m1 + m2);
  return (TWO_PI * a1 * sinI) / (P * Math.sqrt(1 - e * e));
}

// ---------------------------------------------------------------------------
// Numbers as papers print them

/**
 * Decimals for an uncertainty: two significant digits when its leading digit is
 * 1 or 2, one otherwise (common practice). Negative means rounding to tens,
 * hundreds...
 */
function decimalsFor(sigma, rng) {
  const e = Math.floor(Math.log10(sigma));
  const lead = sigma / 10 ** e;
  const digits = lead < 3 || rng.chance(0.25) ? 2 : 1;
  return digits - 1 - e;
}

function fixed(x, decimals) {
  if (decimals > 0) return x.toFixed(decimals);
  const step = 10 ** -decimals;
  return (Math.round(x / step) * step).toFixed(0);
}

/**
 * A value with its uncertainty as text, in one of the forms records use.
 * Returns the text and the numbers it states (so the honest results can be
 * computed from exactly what the record says).
 */
function formatMeasured(value, sigma, unit, rng, { forms = true, asymmetry = 0 } = {}) {
  if (!Number.isFinite(value) || !(sigma > 0 && Number.isFinite(sigma))) {
    throw new Error(`generator: cannot print ${value} ± ${sigma} ${unit}`);
  }
  const unitText = unit === "1" ? "" : ` ${unit}`;
  const big = Math.abs(value) >= 1e6 || Math.abs(value) < 1e-4;
  if (big) {
    const k = Math.floor(Math.log10(Math.abs(value)));
    const scale = 10 ** k;
    const d = decimalsFor(sigma / scale, rng);
    const m = fixed(value / scale, d);
    const s = fixed(sigma / scale, d);
    return {
      text: `(${m} ± ${s}) × 10^${k}${unitText}`,
      value: Number(m) * scale,
      plus: Number(s) * scale,
      minus: Number(s) * scale,
    };
  }
  if (asymmetry > 0) {
    const plus = sigma * (1 + asymmetry);
    const minus = sigma * (1 - asymmetry);
    const d = decimalsFor(minus, rng);
    const v = fixed(value, d);
    const p = fixed(plus, d);
    const mi = fixed(minus, d);
    return { text: `${v} +${p} -${mi}${unitText}`, value: Number(v), plus: Number(p), minus: Number(mi) };
  }
  const d = decimalsFor(sigma, rng);
  const v = fixed(value, d);
  const s = fixed(sigma, d);
  const out = { value: Number(v), plus: Number(s), minus: Number(s) };
  const form = forms ? rng.next() : 0;
  if (form < 0.72) return { ...out, text: `${v} ± ${s}${unitText}` };
  if (form < 0.84) return { ...out, text: `${v} +/- ${s}${unitText}` };
  if (form < 0.95 && d >= 0) {
    const digits = Math.round(Number(s) * 10 ** d);
    return { ...out, text: `${v}(${digits})${unitText}` };
  }
  return { ...out, mapping: { value: v, sigma: s, unit: unit === "1" ? "" : unit } };
}

// ---------------------------------------------------------------------------
// Names and references, all invented

const SURNAMES = [
  "Arvensen", "Quillon", "Marrowby", "Tessaly", "Ondrasek", "Pelletreau", "Ibsworth", "Varkonyi-Hale",
  "Ruthenberg", "Sallow", "Kettleburn", "Amadi-Fenn", "Corvault", "Lindqvast", "Otunde", "Halvorsby",
  "Brisewood", "Yamaguri", "Castelvane", "Dunmere", "Oyelaran", "Pribek", "Solvang-Reyes", "Thistlecombe",
];

const JOURNALS = [
  { name: "Bench Obs. Notes", abbr: "bon" },
  { name: "Synth. Astron. Lett.", abbr: "sal" },
  { name: "Proc. Trial Obs.", abbr: "pto" },
  { name: "J. Made-up Astrophys.", abbr: "jma" },
];

function authors(rng) {
  const n = rng.int(1, 4);
  const names = [];
  while (names.length < n) {
    const s = rng.pick(SURNAMES);
    if (!names.includes(s)) names.push(s);
  }
  if (n === 1) return names[0];
  if (n === 2) return `${names[0]} & ${names[1]}`;
  if (n === 3) return `${names[0]}, ${names[1]} & ${names[2]}`;
  return `${names[0]} et al.`;
}

function reference(rng, year) {
  const journal = rng.pick(JOURNALS);
  const volume = year - 1980 + rng.int(0, 3);
  const page = rng.int(1, 1800);
  const ref = { cite: `${authors(rng)} ${year}, ${journal.name} ${volume}, ${page}` };
  const roll = rng.next();
  if (roll < 0.7) ref.doi = `10.5555/${journal.abbr}.${year}.${volume}.${page}`;
  else if (roll < 0.85) ref.url = `https://example.org/bench/${journal.abbr}/${year}/${page}`;
  ref.locator = `Table ${rng.int(1, 6)}`;
  return ref;
}

// ---------------------------------------------------------------------------
// Scenarios: one kind of object each. `truth` draws the physical system;
// `inputs` lists what a paper of quality q (1 = best) prints, as true values
// with their 1σ; `compute` turns SI inputs keyed by field into SI results
// (GM for masses); `publish` names the results a paper states, with units.

const e0 = (si) => si.eccentricity ?? 0;

const SCENARIOS = [
  {
    id: "visual-parallax",
    weight: 20,
    method: "relative-orbit",
    word: "orbit",
    suffix: " AB",
    about: "a visual binary with an angular orbit and a parallax",
    truth(rng) {
      const total = rng.logUniform(0.4, 4) * GM_SUN;
      const P = rng.logUniform(3, 300) * YEAR;
      const plx = rng.logUniform(8, 250) * 1e-3 * ARCSEC;
      const alpha = (keplerA(total, P) * plx) / AU;
      const q = rng.uniform(0.45, 1);
      return { total, P, plx, alpha, e: rng.uniform(0.05, 0.85), q, split: rng.chance(0.25), useDistance: rng.chance(0.1) };
    },
    inputs(t, q, rng) {
      const alphaUnit = t.alpha > 0.3 * ARCSEC ? "arcsec" : "mas";
      const list = [
        { field: "period", unit: "yr", value: t.P / YEAR, rel: rng.uniform(0.001, 0.02) * q },
        { field: "semimajor_axis", unit: alphaUnit, value: t.alpha / UNIT_SI[alphaUnit], rel: rng.uniform(0.002, 0.02) * q },
        t.useDistance
          ? { field: "distance", unit: "pc", value: AU / t.plx / PC, rel: rng.uniform(0.003, 0.03) * q }
          : { field: "parallax", unit: "mas", value: t.plx / UNIT_SI.mas, rel: rng.uniform(0.002, 0.03) * q },
        { field: "eccentricity", unit: "1", value: t.e, abs: rng.uniform(0.002, 0.03) * q },
      ];
      if (t.split) list.push({ field: "mass_ratio", unit: "1", value: t.q, abs: rng.uniform(0.01, 0.05) * q });
      return list;
    },
    compute(si) {
      const d = si.distance ?? AU / si.parallax;
      const total = keplerGM(si.semimajor_axis * d, si.period);
      const out = { total_mass: total };
      if (si.mass_ratio !== undefined) {
        out.primary_mass = total / (1 + si.mass_ratio);
        out.secondary_mass = (si.mass_ratio * total) / (1 + si.mass_ratio);
      }
      return out;
    },
    publish: (t) => [["total_mass", "Msun"], ...(t.split ? [["primary_mass", "Msun"], ["secondary_mass", "Msun"]] : [])],
  },
  {
    id: "moon-orbit",
    weight: 8,
    method: "relative-orbit",
    word: "moon-orbit",
    suffix: "",
    about: "a giant planet weighed by a moon's orbit, with a linear semi-major axis",
    truth(rng) {
      const total = rng.logUniform(0.05, 3) * GM_JUP;
      const a = rng.logUniform(1e5, 3e6) * 1e3;
      const P = TWO_PI * Math.sqrt(a ** 3 / total);
      return { total, a, P, e: rng.uniform(0.0005, 0.03), kg: rng.chance(0.15) };
    },
    inputs(t, q, rng) {
      return [
        { field: "period", unit: "d", value: t.P / DAY, rel: rng.uniform(1e-6, 1e-5) * q },
        { field: "semimajor_axis", unit: "km", value: t.a / 1e3, rel: rng.uniform(1e-5, 1e-4) * q },
        { field: "eccentricity", unit: "1", value: t.e, abs: t.e * rng.uniform(0.02, 0.1) * q },
      ];
    },
    compute: (si) => ({ total_mass: keplerGM(si.semimajor_axis, si.period) }),
    publish: (t) => [["total_mass", t.kg ? "kg" : "Mjup"]],
  },
  {
    id: "astrometric",
    weight: 12,
    method: "astrometric-orbit",
    word: "astrometry",
    suffix: "",
    about: "a star wobbling about an unseen companion",
    truth(rng) {
      const m1 = rng.uniform(0.2, 1.2) * GM_SUN;
      const m2 = rng.logUniform(0.01, 0.5) * GM_SUN;
      const P = rng.logUniform(0.5, 30) * YEAR;
      const plx = rng.logUniform(10, 200) * 1e-3 * ARCSEC;
      const a1 = (keplerA(m1 + m2, P) * m2) / (m1 + m2);
      return { m1, m2, P, plx, alpha1: (a1 * plx) / AU, e: rng.uniform(0, 0.6), withPrimary: rng.chance(0.7) };
    },
    inputs(t, q, rng) {
      const list = [
        { field: "period", unit: t.P > 2 * YEAR ? "yr" : "d", value: t.P / (t.P > 2 * YEAR ? YEAR : DAY), rel: rng.uniform(0.005, 0.05) * q },
        { field: "semimajor_axis", unit: "mas", value: t.alpha1 / UNIT_SI.mas, rel: rng.uniform(0.01, 0.08) * q },
        { field: "parallax", unit: "mas", value: t.plx / UNIT_SI.mas, rel: rng.uniform(0.003, 0.02) * q },
        { field: "eccentricity", unit: "1", value: t.e, abs: rng.uniform(0.01, 0.06) * q, minimum: 0 },
      ];
      if (t.withPrimary) list.push({ field: "primary_mass", unit: "Msun", value: t.m1 / GM_SUN, rel: rng.uniform(0.03, 0.08) });
      return list;
    },
    compute(si) {
      const a1 = (si.semimajor_axis * AU) / si.parallax;
      const f = keplerGM(a1, si.period);
      const out = { mass_function: f };
      if (si.primary_mass !== undefined) out.secondary_mass = companionMass(f, si.primary_mass, 1);
      return out;
    },
    publish: (t) => (t.withPrimary ? [["secondary_mass", t.m2 < 0.075 * GM_SUN ? "Mjup" : "Msun"]] : [["mass_function", "Msun"]]),
  },
  {
    id: "single-lined",
    weight: 12,
    method: "single-lined",
    word: "velocities",
    suffix: "",
    about: "a single-lined spectroscopic binary",
    truth(rng) {
      return {
        P: rng.logUniform(1, 2000) * DAY,
        K: rng.logUniform(5, 80) * 1e3,
        e: rng.uniform(0.02, 0.5),
        circular: rng.chance(0.2),
        a1Unit: rng.pick(["R_sun", "au"]),
      };
    },
    inputs(t, q, rng) {
      const list = [
        { field: "period", unit: "d", value: t.P / DAY, rel: rng.uniform(1e-5, 1e-3) * q },
        { field: "k1", unit: "km/s", value: t.K / 1e3, rel: rng.uniform(0.005, 0.03) * q },
      ];
      if (!t.circular) list.push({ field: "eccentricity", unit: "1", value: t.e, abs: rng.uniform(0.003, 0.03) * q });
      return list;
    },
    compute(si) {
      const e = e0(si);
      return {
        mass_function: massFunctionSB(si.period, si.k1, e),
        a1_sin_i: (si.k1 * si.period * Math.sqrt(1 - e * e)) / TWO_PI,
      };
    },
    publish: (t) => [["mass_function", "Msun"], ["a1_sin_i", t.a1Unit]],
  },
  {
    id: "planet",
    weight: 18,
    method: "single-lined",
    word: "velocities",
    suffix: " b",
    about: "a planet found by radial velocities, with the star's mass from elsewhere",
    truth(rng) {
      const m1 = rng.uniform(0.5, 1.4) * GM_SUN;
      const mp = rng.logUniform(3, 3200) * GM_EARTH;
      const P = rng.logUniform(1, 1500) * DAY;
      const e = rng.chance(0.3) ? 0 : rng.uniform(0.02, 0.4);
      return { m1, mp, P, e, K: semiAmplitude(m1, mp, P, e, 1) };
    },
    inputs(t, q, rng) {
      const list = [
        { field: "period", unit: "d", value: t.P / DAY, rel: rng.uniform(1e-5, 1e-3) * q },
        { field: "k1", unit: "m/s", value: t.K, rel: rng.uniform(0.03, 0.15) * q },
      ];
      if (t.e > 0) list.push({ field: "eccentricity", unit: "1", value: t.e, abs: Math.min(rng.uniform(0.01, 0.06) * q, t.e / 2), minimum: 0 });
      list.push({ field: "primary_mass", unit: "Msun", value: t.m1 / GM_SUN, rel: rng.uniform(0.02, 0.06) });
      return list;
    },
    compute(si) {
      const f = massFunctionSB(si.period, si.k1, e0(si));
      return { min_secondary_mass: companionMass(f, si.primary_mass, 1) };
    },
    publish: (t) => [["min_secondary_mass", t.mp < 30 * GM_EARTH ? "Mearth" : "Mjup"]],
  },
  {
    id: "compact",
    weight: 8,
    method: "single-lined",
    word: "velocities",
    suffix: "",
    about: "a star orbiting a compact companion, with an inclination from its light curve",
    truth(rng) {
      const m1 = rng.uniform(0.5, 2) * GM_SUN;
      const m2 = rng.uniform(1.2, 12) * GM_SUN;
      const P = rng.logUniform(0.2, 10) * DAY;
      const i = rng.uniform(25, 80) * (Math.PI / 180);
      const e = rng.uniform(0.01, 0.05);
      return { m1, m2, P, i, e, K: semiAmplitude(m1, m2, P, e, Math.sin(i)) };
    },
    inputs(t, q, rng) {
      return [
        { field: "period", unit: "d", value: t.P / DAY, rel: rng.uniform(1e-5, 3e-4) * q },
        { field: "k1", unit: "km/s", value: t.K / 1e3, rel: rng.uniform(0.005, 0.03) * q },
        { field: "eccentricity", unit: "1", value: t.e, abs: t.e * rng.uniform(0.1, 0.4), minimum: 0 },
        { field: "inclination", unit: "deg", value: (t.i * 180) / Math.PI, abs: rng.uniform(1, 5) * q },
        { field: "primary_mass", unit: "Msun", value: t.m1 / GM_SUN, rel: rng.uniform(0.05, 0.15) },
      ];
    },
    compute(si) {
      const f = massFunctionSB(si.period, si.k1, e0(si));
      return { mass_function: f, secondary_mass: companionMass(f, si.primary_mass, Math.sin(si.inclination)) };
    },
    publish: () => [["mass_function", "Msun"], ["secondary_mass", "Msun"]],
  },
  {
    id: "eclipsing",
    weight: 14,
    method: "double-lined",
    word: "spectra",
    suffix: "",
    about: "a double-lined eclipsing binary",
    truth(rng) {
      const m1 = rng.uniform(0.6, 3) * GM_SUN;
      const q = rng.uniform(0.5, 1);
      const P = rng.logUniform(1, 40) * DAY;
      const withI = rng.chance(0.85);
      const i = (withI ? rng.uniform(80, 89.8) : rng.uniform(40, 80)) * (Math.PI / 180);
      const e = rng.chance(0.3) ? 0 : rng.uniform(0.01, 0.3);
      const K1 = semiAmplitude(m1, q * m1, P, e, Math.sin(i));
      return { m1, q, P, i, e, K1, K2: K1 / q, withI, ratio: rng.chance(0.3) };
    },
    inputs(t, q, rng) {
      const list = [
        { field: "period", unit: "d", value: t.P / DAY, rel: rng.uniform(1e-6, 1e-5) * q },
        { field: "k1", unit: "km/s", value: t.K1 / 1e3, rel: rng.uniform(0.003, 0.015) * q },
        { field: "k2", unit: "km/s", value: t.K2 / 1e3, rel: rng.uniform(0.003, 0.015) * q },
      ];
      if (t.e > 0) list.push({ field: "eccentricity", unit: "1", value: t.e, abs: Math.min(rng.uniform(0.001, 0.01) * q, t.e / 3) });
      if (t.withI) list.push({ field: "inclination", unit: "deg", value: (t.i * 180) / Math.PI, abs: rng.uniform(0.1, 0.5) * q, maximum: 90 });
      return list;
    },
    compute(si) {
      const e = e0(si);
      const c = (si.period * (1 - e * e) ** 1.5 * (si.k1 + si.k2) ** 2) / TWO_PI;
      const out = { m1_sin3i: c * si.k2, m2_sin3i: c * si.k1, mass_ratio: si.k1 / si.k2 };
      if (si.inclination !== undefined) {
        const s3 = Math.sin(si.inclination) ** 3;
        out.primary_mass = out.m1_sin3i / s3;
        out.secondary_mass = out.m2_sin3i / s3;
      }
      return out;
    },
    publish: (t) => [
      ...(t.withI ? [["primary_mass", "Msun"], ["secondary_mass", "Msun"]] : [["m1_sin3i", "Msun"], ["m2_sin3i", "Msun"]]),
      ...(t.ratio ? [["mass_ratio", "1"]] : []),
    ],
  },
  {
    id: "rotation",
    weight: 5,
    method: "circular-velocity",
    word: "rotation",
    suffix: "",
    about: "a spiral galaxy weighed by its rotation curve",
    truth(rng) {
      return { v: rng.uniform(80, 320) * 1e3, r: rng.uniform(5, 40) * 1e3 * PC };
    },
    inputs(t, q, rng) {
      return [
        { field: "velocity", unit: "km/s", value: t.v / 1e3, rel: rng.uniform(0.02, 0.06) * q },
        { field: "radius", unit: "kpc", value: t.r / (1e3 * PC), rel: rng.uniform(0.03, 0.08) * q },
      ];
    },
    compute: (si) => ({ enclosed_mass: si.velocity ** 2 * si.radius }),
    publish: () => [["enclosed_mass", "Msun"]],
  },
  {
    id: "maser-disc",
    weight: 3,
    method: "circular-velocity",
    word: "maser-disc",
    suffix: "",
    about: "a galaxy nucleus weighed by a rotating disc of masers, with an angular radius and a distance",
    truth(rng) {
      const v = rng.uniform(300, 1100) * 1e3;
      const r = rng.uniform(0.1, 1) * PC;
      const d = rng.logUniform(3, 30) * 1e6 * PC;
      return { v, theta: r / d, d };
    },
    inputs(t, q, rng) {
      return [
        { field: "velocity", unit: "km/s", value: t.v / 1e3, rel: rng.uniform(0.005, 0.03) * q },
        { field: "radius", unit: "mas", value: t.theta / UNIT_SI.mas, rel: rng.uniform(0.01, 0.05) * q },
        { field: "distance", unit: "Mpc", value: t.d / (1e6 * PC), rel: rng.uniform(0.03, 0.1) * q },
      ];
    },
    compute: (si) => ({ enclosed_mass: si.velocity ** 2 * si.radius * si.distance }),
    publish: () => [["enclosed_mass", "Msun"]],
  },
];

const TOTAL_WEIGHT = SCENARIOS.reduce((s, x) => s + x.weight, 0);

/** The scenarios, for tests and reports: id, method. */
export const SCENARIO_LIST = Object.freeze(SCENARIOS.map((s) => Object.freeze({ id: s.id, method: s.method })));

function pickScenario(rng) {
  let r = rng.next() * TOTAL_WEIGHT;
  for (const s of SCENARIOS) {
    r -= s.weight;
    if (r < 0) return s;
  }
  return SCENARIOS[SCENARIOS.length - 1];
}

// ---------------------------------------------------------------------------
// One measurement

/** First-order 1σ of each result by central differences over the stated inputs. */
function propagate(compute, si, sigmas) {
  const base = compute(si);
  const variance = Object.fromEntries(Object.keys(base).map((k) => [k, 0]));
  for (const [field, sigma] of Object.entries(sigmas)) {
    if (!(sigma > 0)) continue;
    const h = sigma * 1e-3;
    const up = compute({ ...si, [field]: si[field] + h });
    const down = compute({ ...si, [field]: si[field] - h });
    for (const k of Object.keys(base)) {
      const d = (up[k] - down[k]) / (2 * h);
      variance[k] += (d * sigma) ** 2;
    }
  }
  return { value: base, sigma: Object.fromEntries(Object.entries(variance).map(([k, v]) => [k, Math.sqrt(v)])) };
}

/**
 * Whether an input lies where the methods accept it and records print it:
 * 0 ≤ e < 0.95 when drawn (< 1 once rounded), an inclination clear of 0° and
 * 180° (and within its upper bound, 90° for eclipses), and every size at least
 * `margin` σ above zero.
 */
function inDomain(input, value, sigma, margin = 2) {
  if (!Number.isFinite(value) || !(sigma > 0)) return false;
  if (input.field === "eccentricity") return value >= 0 && value < (margin > 1 ? 0.95 : 1);
  if (input.field === "inclination") return value > margin * sigma && value < 180 - margin * sigma && value <= (input.maximum ?? 180);
  return value > margin * sigma;
}

/** The 1σ a paper of this quality states, kept small enough that the true value sits well inside the domain. */
function statedSigma(input) {
  let sigma = input.abs ?? Math.abs(input.value) * input.rel;
  if (input.field === "inclination") sigma = Math.min(sigma, input.value / 4, (180 - input.value) / 4);
  else if (input.field !== "eccentricity") sigma = Math.min(sigma, Math.abs(input.value) / 4);
  return sigma;
}

/** A measured value: the truth plus a normal error of the stated σ, redrawn until it is in the domain. */
function observe(input, rng) {
  const sigma = statedSigma(input);
  const floor = input.field === "eccentricity" ? 0 : input.minimum;
  for (let attempt = 0; attempt < 50; attempt++) {
    let value = input.value + rng.normal() * sigma;
    // e.g. an eccentricity measured just above zero: reflected, as a fit bounded at zero would give
    if (floor !== undefined && value < floor) value = floor + (floor - value);
    if (input.maximum !== undefined && value > input.maximum) value = input.maximum - (value - input.maximum);
    if (inDomain(input, value, sigma)) return { value, sigma };
  }
  return { value: input.value, sigma };
}

/** In-unit value of a result from its SI (GM form for masses). */
const inUnit = (si, unit) => si / UNIT_SI[unit];

function makeMeasurement(rng, scenario, truth, quality, slip) {
  const inputs = {};
  const si = {};
  const sigmas = {};
  for (const input of scenario.inputs(truth, quality, rng)) {
    const seen = observe(input, rng);
    const asymmetry = rng.chance(0.06) ? rng.uniform(0.15, 0.4) : 0;
    const printed = formatMeasured(seen.value, seen.sigma, input.unit, rng, { asymmetry });
    // printed: rounding may move it a little, but never out of range nor below its own σ
    if (!inDomain(input, printed.value, Math.max(printed.plus, printed.minus), 1)) {
      throw new Error(`generator: ${input.field} printed as ${JSON.stringify(printed.text ?? printed.mapping)} is outside what records accept`);
    }
    inputs[input.field] = printed.mapping ?? printed.text;
    si[input.field] = printed.value * UNIT_SI[input.unit];
    sigmas[input.field] = ((printed.plus + printed.minus) / 2) * UNIT_SI[input.unit];
  }
  if (slip === "not-compared") return { inputs, published: undefined };
  const results = propagate(scenario.compute, si, sigmas);
  const published = {};
  const list = scenario.publish(truth);
  list.forEach(([name, unit], index) => {
    const sigma = inUnit(results.sigma[name], unit);
    let value = inUnit(results.value[name], unit);
    // the first stated result carries the slip, if any: k σ off, either way
    if (index === 0 && slip !== "honest") {
      const k = slip === "tension" ? rng.uniform(1.4, 2.6) : rng.uniform(4.5, 15);
      const sign = rng.chance(0.5) || value - k * sigma <= 0 ? 1 : -1;
      value += sign * k * sigma;
    }
    // an asymmetric published σ only where no slip is meant, so a slip's side σ stays the one it was sized by
    const asymmetry = (index > 0 || slip === "honest") && rng.chance(0.05) ? rng.uniform(0.1, 0.3) : 0;
    published[name] = formatMeasured(value, sigma, unit, rng, { forms: false, asymmetry }).text;
  });
  return { inputs, published };
}

function pickSlip(rng) {
  const r = rng.next();
  if (r < SLIP_RATES.notCompared) return "not-compared";
  if (r < SLIP_RATES.notCompared + SLIP_RATES.tension) return "tension";
  if (r < SLIP_RATES.notCompared + SLIP_RATES.tension + SLIP_RATES.discrepant) return "discrepant";
  return "honest";
}

// ---------------------------------------------------------------------------
// One object, as YAML text

const quote = (s) => JSON.stringify(s);

function yamlValue(v) {
  if (typeof v === "string") return quote(v);
  // mapping form: value as a string keeps its printed decimals; sigma as a number
  const unit = v.unit === "" ? "" : `, unit: ${quote(v.unit)}`;
  return `{ value: ${quote(v.value)}, sigma: ${v.sigma}${unit} }`;
}

/** Designation and id of object number n. */
export function designation(n, scenario) {
  const name = `BNCH ${n}${scenario.suffix}`;
  return { name, id: name.toLowerCase().replace(/[^a-z0-9]+/g, "-") };
}

/** The relative path of object n's file, and its text. Object n is the same whatever the count. */
export function objectRecord(n, seed) {
  const rng = makeRandom(`${seed}/${n}`);
  const scenario = pickScenario(rng);
  const truth = scenario.truth(rng);
  const { name, id } = designation(n, scenario);
  const count = rng.chance(0.55) ? 1 : rng.chance(0.67) ? 2 : 3;
  const years = [];
  while (years.length < count) {
    const y = rng.int(1995, 2025);
    years.push(y);
  }
  years.sort((a, b) => b - a);
  const usedKeys = new Set();
  const keys = [];
  const slips = [];
  const lines = [
    `name: ${name}`,
    `id: ${quote(id)}`,
    "notes: >-",
    `  Invented object number ${n} of the benchmark catalogue (seed ${quote(String(seed))}): ${scenario.about}.`,
    "  Its numbers and the papers cited are made up.",
    "measurements:",
  ];
  years.forEach((year, index) => {
    let key = `${scenario.word}-${year}`;
    for (let k = 2; usedKeys.has(key); k++) key = `${scenario.word}-${year}-${k}`;
    usedKeys.add(key);
    keys.push(key);
    // older papers are less precise
    const quality = index === 0 ? rng.uniform(0.6, 1.2) : rng.uniform(1.5, 4);
    const slip = pickSlip(rng);
    slips.push(slip);
    const ref = reference(rng, year);
    const m = makeMeasurement(rng, scenario, truth, quality, slip);
    lines.push(`  - key: ${key}`, `    method: ${scenario.method}`, "    reference:", `      cite: ${quote(ref.cite)}`);
    if (ref.doi) lines.push(`      doi: ${quote(ref.doi)}`);
    if (ref.url) lines.push(`      url: ${quote(ref.url)}`);
    lines.push(`      locator: ${quote(ref.locator)}`, "    inputs:");
    for (const [field, v] of Object.entries(m.inputs)) lines.push(`      ${field}: ${yamlValue(v)}`);
    if (m.published) {
      lines.push("    published:");
      for (const [field, v] of Object.entries(m.published)) lines.push(`      ${field}: ${quote(v)}`);
    }
    if (index > 0 && rng.chance(0.3)) {
      lines.push("    use: false", `    comment: ${quote(`Superseded by the ${years[0]} measurement, which is more precise.`)}`);
    }
  });
  const folder = String(Math.floor((n - 1) / FILES_PER_FOLDER)).padStart(3, "0");
  return {
    id,
    file: `${folder}/${id}.yaml`,
    text: lines.join("\n") + "\n",
    scenario: scenario.id,
    method: scenario.method,
    measurements: count,
    /** Measurement keys in file order, and what each published block was made to be. */
    keys,
    slips,
  };
}

/**
 * Writes `count` records (objects 1..count) under `dir` and returns a summary:
 * files, measurements, bytes, counts per scenario and per intended outcome.
 */
export function generateCatalogue(dir, count, seed = 1) {
  if (!Number.isInteger(count) || count < 1) throw new Error(`generateCatalogue: count must be a positive whole number, got ${count}`);
  const summary = { objects: count, seed: String(seed), files: 0, measurements: 0, bytes: 0, scenarios: {}, methods: {}, intended: {} };
  const made = new Set();
  for (let n = 1; n <= count; n++) {
    const r = objectRecord(n, seed);
    const target = path.join(dir, r.file);
    const folder = path.dirname(target);
    if (!made.has(folder)) {
      mkdirSync(folder, { recursive: true });
      made.add(folder);
    }
    writeFileSync(target, r.text);
    summary.files++;
    summary.measurements += r.measurements;
    summary.bytes += Buffer.byteLength(r.text);
    summary.scenarios[r.scenario] = (summary.scenarios[r.scenario] ?? 0) + 1;
    summary.methods[r.method] = (summary.methods[r.method] ?? 0) + r.measurements;
    for (const s of r.slips) summary.intended[s] = (summary.intended[s] ?? 0) + 1;
  }
  return summary;
}

// ---------------------------------------------------------------------------
// Command line

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const [dir, countText, seed = "1"] = process.argv.slice(2);
  const count = Number(countText);
  if (!dir || !Number.isInteger(count) || count < 1) {
    process.stderr.write("usage: node bench/generate.mjs DIR COUNT [SEED]\n  writes COUNT invented records under DIR\n");
    process.exitCode = 2;
  } else {
    const summary = generateCatalogue(path.resolve(dir), count, seed);
    process.stdout.write(JSON.stringify(summary, null, 2) + "\n");
  }
}
