import * as codata2014 from "../constants/codata2014.js";
import type { SlotInput } from "../records/types.js";
import { unitById } from "../units/catalog.js";
import type { Change, DiagnosisContext, Hypothesis, InputChange } from "./types.js";

/**
 * The slips a diagnosis tries, one declarative entry each. To add one, append
 * an entry: its id, a plain title and description, the methods and results it
 * concerns, when it applies, and the change it makes. The order here does not
 * matter: explanations are ranked by how well they reconcile.
 */

const RELATIVE = "relative-orbit";
const ASTROMETRIC = "astrometric-orbit";
const SINGLE = "single-lined";
const DOUBLE = "double-lined";
const CIRCULAR = "circular-velocity";

const WITH_PERIOD = [RELATIVE, ASTROMETRIC, SINGLE, DOUBLE];
const WITH_DISTANCE = [RELATIVE, ASTROMETRIC, CIRCULAR];
const VELOCITY_CURVES = [SINGLE, DOUBLE];

/** The Julian year of the record's "yr": 365.25 d exactly (IAU). */
const JULIAN_YEAR_DAYS = 365.25;
/**
 * The Gaussian year, 2π/k days with the Gaussian gravitational constant
 * k = 0.01720209895 (an IAU defining constant until 2012, from memory): the
 * year in which a³/P² with a in au gives the mass in solar masses exactly.
 */
const GAUSSIAN_YEAR_DAYS = (2 * Math.PI) / 0.01720209895;

/** Solar radius 6.9599 × 10⁸ m of Allen's Astrophysical Quantities (from memory), used before the IAU 2015 nominal value. */
const OLD_SOLAR_RADIUS_M = 6.9599e8;

const input = (ctx: DiagnosisContext, slot: string): SlotInput | undefined => ctx.record.inputs[slot];
const unitOf = (ctx: DiagnosisContext, slot: string): string | undefined => input(ctx, slot)?.quantity.unit.id;
const hasSlot = (ctx: DiagnosisContext, slot: string): boolean => input(ctx, slot) !== undefined;
const siOf = (ctx: DiagnosisContext, slot: string): number | undefined => {
  const q = input(ctx, slot)?.quantity;
  return q ? q.value * q.unit.scale : undefined;
};
const uncertain = (ctx: DiagnosisContext, slot: string): boolean => {
  const q = input(ctx, slot)?.quantity;
  return q !== undefined && (q.plus > 0 || q.minus > 0);
};
const scale = (slot: string, factor: number): InputChange => ({ kind: "scale", slot, factor });

/** A number for a phrase: six significant digits at most, no trailing zeros. */
function short(x: number): string {
  return String(Number(x.toPrecision(6)));
}

// ---------------------------------------------------------------------------
// Period: year lengths and days for years

interface YearLength {
  readonly id: string;
  readonly name: string;
  /** The length alone, for "years of 365 d". */
  readonly span: string;
  readonly days: number;
  readonly source: string;
}

const YEARS: readonly YearLength[] = [
  { id: "year-365d", name: "a 365 d year", span: "365 d", days: 365, source: "a calendar year of 365 days" },
  { id: "year-julian", name: "the Julian year of 365.25 d", span: "365.25 d", days: JULIAN_YEAR_DAYS, source: "the Julian year (IAU)" },
  { id: "year-sidereal", name: "the sidereal year of 365.25636 d", span: "365.25636 d", days: 365.25636, source: "the sidereal year (from memory)" },
  { id: "year-tropical", name: "the tropical year of 365.24219 d", span: "365.24219 d", days: 365.24219, source: "the tropical year (from memory)" },
  {
    id: "year-gaussian",
    name: `the Gaussian year of ${short(GAUSSIAN_YEAR_DAYS)} d`,
    span: `${short(GAUSSIAN_YEAR_DAYS)} d`,
    days: GAUSSIAN_YEAR_DAYS,
    source: "the Gaussian year 2π/k with k = 0.01720209895 (from memory)",
  },
];

/** Methods where a paper may have used M = a³/P² in au, years and solar masses. */
const KEPLER_IN_YEARS = [RELATIVE, ASTROMETRIC];

/**
 * How the period the paper used compares with ours, or undefined when the
 * slip cannot arise:
 * - typed in yr (read as Julian years): the paper turned years into time with
 *   another year length L, so its period is ours × L / 365.25;
 * - typed in d, for a Kepler's-law method: the paper turned days into years
 *   with a year length L and then used M = a³/P² in au, years and solar
 *   masses, which holds for the Gaussian year; its period is then in effect
 *   ours × (Gaussian year) / L.
 */
function yearFactor(ctx: DiagnosisContext, y: YearLength): number | undefined {
  const unit = unitOf(ctx, "period");
  let factor: number | undefined;
  if (unit === "yr") factor = y.days / JULIAN_YEAR_DAYS;
  else if (unit === "d" && KEPLER_IN_YEARS.includes(ctx.method.id)) factor = GAUSSIAN_YEAR_DAYS / y.days;
  return factor !== undefined && factor !== 1 ? factor : undefined;
}

const yearHypotheses: Hypothesis[] = YEARS.map((y) => ({
  id: y.id,
  title: `Period converted with ${y.name}`,
  description:
    `A period typed in years is read as Julian years of 365.25 d; the paper may have turned years into time with ` +
    `${y.source} instead. Or a period typed in days may have been turned into years with it before using ` +
    `M = a³/P² in au, years and solar masses, which holds exactly only for the Gaussian year of ` +
    `${short(GAUSSIAN_YEAR_DAYS)} d (2π/k with the Gaussian constant k = 0.01720209895, from memory).`,
  methods: WITH_PERIOD,
  applies: (ctx) => yearFactor(ctx, y) !== undefined,
  transform: (ctx): Change | undefined => {
    const factor = yearFactor(ctx, y);
    if (factor === undefined) return undefined;
    const phrase =
      unitOf(ctx, "period") === "yr"
        ? `with ${y.name} instead of the Julian 365.25 d`
        : `with the days turned into years of ${y.span} and M = a³/P² in au, years and solar masses`;
    return { inputs: [scale("period", factor)], phrase };
  },
}));

const daysAsYears: Hypothesis = {
  id: "days-as-years",
  title: "Period in days taken as years",
  description: "The period is given in days, but the published mass may have been computed as if the same number were years.",
  methods: WITH_PERIOD,
  applies: (ctx) => unitOf(ctx, "period") === "d",
  transform: () => ({ inputs: [scale("period", JULIAN_YEAR_DAYS)], phrase: "if the period in days had been taken as years" }),
};

const yearsAsDays: Hypothesis = {
  id: "years-as-days",
  title: "Period in years taken as days",
  description: "The period is given in years, but the published mass may have been computed as if the same number were days.",
  methods: WITH_PERIOD,
  applies: (ctx) => unitOf(ctx, "period") === "yr",
  transform: () => ({ inputs: [scale("period", 1 / JULIAN_YEAR_DAYS)], phrase: "if the period in years had been taken as days" }),
};

// ---------------------------------------------------------------------------
// Masses: the companion ignored, the small-mass shortcut, G

const totalAsPrimary: Hypothesis = {
  id: "total-as-primary",
  title: "Companion's mass ignored",
  description:
    "Kepler's third law gives the total mass of the pair; the paper may have reported it as the primary's mass, " +
    "as if the companion weighed nothing.",
  methods: [RELATIVE],
  results: ["primary_mass"],
  applies: (ctx) => ctx.audit.results.total_mass !== undefined,
  transform: () => ({ result: { kind: "use-result", result: "total_mass" }, phrase: "if the total mass had been reported as the primary's" }),
};

/** The companion's mass from (f M₁²)^{1/3} / sin i, the shortcut that holds only when the companion is light. */
const smallMassShortcut: Hypothesis = {
  id: "small-mass-shortcut",
  title: "Small-companion shortcut used",
  description:
    "The exact companion mass solves (M₂ sin i)³ = f (M₁ + M₂)²; the shortcut M₂ sin i ≈ (f M₁²)^{1/3} drops M₂ beside M₁ " +
    "and underestimates a companion that is not small.",
  methods: [SINGLE, ASTROMETRIC],
  results: ["secondary_mass", "min_secondary_mass"],
  applies: (ctx) => ctx.audit.results.mass_function !== undefined && hasSlot(ctx, "primary_mass"),
  transform: (ctx): Change | undefined => {
    const f = ctx.audit.results.mass_function?.value_si;
    const m1 = siOf(ctx, "primary_mass");
    if (f === undefined || m1 === undefined) return undefined;
    // SI throughout: f and M₁ in kg, so the cube root is in kg too
    let sinI = 1;
    if (ctx.method.id === SINGLE && ctx.result === "secondary_mass") {
      const i = siOf(ctx, "inclination");
      if (i === undefined) return undefined;
      sinI = Math.abs(Math.sin(i));
    }
    return { result: { kind: "value", value_si: Math.cbrt(f * m1 * m1) / sinI }, phrase: "with the shortcut M₂ sin i ≈ (f M₁²)^{1/3}" };
  },
};

const MASS_IN_KG = new Set(["kg", "g"]);

const g2014: Hypothesis = {
  id: "g-codata-2014",
  title: "Older value of G for kilograms",
  description:
    "A mass in kilograms depends on G. The record uses CODATA 2018 (6.67430 × 10⁻¹¹); a paper using CODATA 2014 " +
    "(6.67408 × 10⁻¹¹) differs by 33 parts per million.",
  methods: [RELATIVE, ASTROMETRIC, SINGLE, DOUBLE, CIRCULAR],
  applies: (ctx) =>
    MASS_IN_KG.has(ctx.comparison.published_unit) ||
    Object.values(ctx.record.inputs).some((i) => MASS_IN_KG.has(i.quantity.unit.id)),
  transform: (ctx): Change => {
    const ratio = codata2014.G.value / ctx.constants.G.value;
    const inputs = Object.values(ctx.record.inputs)
      .filter((i) => MASS_IN_KG.has(i.quantity.unit.id))
      .map((i) => scale(i.slot, ratio));
    const out: Change = {
      inputs,
      phrase: "with G from CODATA 2014",
      ...(MASS_IN_KG.has(ctx.comparison.published_unit) ? { result: { kind: "factor", factor: 1 / ratio } as const } : {}),
    };
    return out;
  },
};

// ---------------------------------------------------------------------------
// Semi-major axis: barycentric and relative

/** The mass ratio q = M₂/M₁ the measurement gives or uses. */
function massRatio(ctx: DiagnosisContext): number | undefined {
  const q = siOf(ctx, "mass_ratio");
  if (q !== undefined) return q;
  const m1 = ctx.audit.results.primary_mass?.value_si ?? siOf(ctx, "primary_mass");
  const m2 = ctx.audit.results.secondary_mass?.value_si ?? siOf(ctx, "secondary_mass");
  return m1 !== undefined && m2 !== undefined && m1 > 0 && m2 > 0 ? m2 / m1 : undefined;
}

function axisSlot(ctx: DiagnosisContext): string | undefined {
  return ["semimajor_axis", "angular_semimajor_axis"].find((s) => hasSlot(ctx, s));
}

/** A slip that rescales the semi-major axis by a factor of the mass ratio q. */
function axisScaling(id: string, title: string, description: string, factor: (q: number) => number, phrase: (q: string) => string): Hypothesis {
  return {
    id,
    title,
    description,
    methods: [RELATIVE, ASTROMETRIC],
    applies: (ctx) => axisSlot(ctx) !== undefined && massRatio(ctx) !== undefined,
    transform: (ctx): Change | undefined => {
      const slot = axisSlot(ctx);
      const q = massRatio(ctx);
      if (!slot || q === undefined) return undefined;
      return { inputs: [scale(slot, factor(q))], phrase: phrase(short(q)) };
    },
  };
}

const usedBarycentric = axisScaling(
  "barycentric-as-relative",
  "Barycentric a₁ used as the relative semi-major axis",
  "The relative orbit is larger than one star's orbit about the barycentre: a = a₁(1+q)/q. The published mass may have " +
    "been computed with a₁ = a q/(1+q) where the relative a belongs, or the axis typed is the relative one where the " +
    "method needs a₁.",
  (q) => q / (1 + q),
  (q) => `with a₁ = a q/(1+q) (q = ${q}) in place of the relative a`,
);

const usedRelative = axisScaling(
  "relative-as-barycentric",
  "Relative semi-major axis used as the barycentric a₁",
  "The reverse slip: the published mass may have been computed with the relative a = a₁(1+q)/q where one star's " +
    "barycentric a₁ belongs, or the axis typed is a₁ where the method needs the relative a.",
  (q) => (1 + q) / q,
  (q) => `with the relative a = a₁(1+q)/q (q = ${q}) in place of a₁`,
);

// ---------------------------------------------------------------------------
// Inclination: sin³i

interface SinePower {
  readonly id: string;
  readonly title: string;
  readonly description: string;
  /** The paper divided by sin^p i instead of sin³ i. */
  readonly power: number;
  readonly phrase: string;
}

const SINE_POWERS: readonly SinePower[] = [
  {
    id: "sin3i-omitted",
    title: "sin³i not applied",
    description: "The velocity curves give M sin³i; the published mass may be M sin³i itself, or a minimum mass reported as the mass.",
    power: 0,
    phrase: "without dividing by sin³i",
  },
  {
    id: "sin3i-twice",
    title: "sin³i applied twice",
    description: "The published mass may have been divided by sin³i twice, once in the projected mass and again after.",
    power: 6,
    phrase: "dividing by sin³i twice",
  },
  {
    id: "sin-i-for-sin3i",
    title: "sin i used instead of sin³i",
    description: "The published mass may have been divided by sin i where sin³i belongs.",
    power: 1,
    phrase: "dividing by sin i instead of sin³i",
  },
];

const sineHypotheses: Hypothesis[] = SINE_POWERS.map((p) => ({
  id: p.id,
  title: p.title,
  description: p.description,
  methods: VELOCITY_CURVES,
  results: ["primary_mass", "secondary_mass"],
  applies: (ctx) => hasSlot(ctx, "inclination"),
  transform: (ctx): Change | undefined => {
    const i = siOf(ctx, "inclination");
    if (i === undefined) return undefined;
    // the effective sin i whose cube is sin^p i
    const s = Math.abs(Math.sin(i)) ** (p.power / 3);
    if (!(s > 0 && s <= 1)) return undefined;
    return { inputs: [{ kind: "set", slot: "inclination", value_si: Math.asin(s) }], phrase: p.phrase };
  },
}));

// ---------------------------------------------------------------------------
// Semi-amplitudes: 2K for K, K₁ and K₂ swapped

interface AmplitudeSlip {
  readonly id: string;
  readonly title: string;
  readonly methods: readonly string[];
  readonly slots: readonly string[];
  readonly factor: number;
  readonly phrase: string;
}

const AMPLITUDE_SLIPS: readonly AmplitudeSlip[] = [
  { id: "k-doubled", title: "Full amplitude 2K used as K", methods: VELOCITY_CURVES, slots: ["k1", "k2"], factor: 2, phrase: "with 2K in place of every K" },
  { id: "k-halved", title: "K typed is the full amplitude 2K", methods: VELOCITY_CURVES, slots: ["k1", "k2"], factor: 0.5, phrase: "with every K halved" },
  { id: "k1-doubled", title: "Full amplitude 2K₁ used as K₁", methods: [DOUBLE], slots: ["k1"], factor: 2, phrase: "with 2K₁ in place of K₁" },
  { id: "k2-doubled", title: "Full amplitude 2K₂ used as K₂", methods: [DOUBLE], slots: ["k2"], factor: 2, phrase: "with 2K₂ in place of K₂" },
  { id: "k1-halved", title: "K₁ typed is the full amplitude 2K₁", methods: [DOUBLE], slots: ["k1"], factor: 0.5, phrase: "with K₁ halved" },
  { id: "k2-halved", title: "K₂ typed is the full amplitude 2K₂", methods: [DOUBLE], slots: ["k2"], factor: 0.5, phrase: "with K₂ halved" },
];

const amplitudeHypotheses: Hypothesis[] = AMPLITUDE_SLIPS.map((a) => ({
  id: a.id,
  title: a.title,
  description:
    "The semi-amplitude K is half the peak-to-peak swing of the velocity curve; taking one for the other changes the " +
    "mass function by a factor of 8 and the masses by up to the same.",
  methods: a.methods,
  applies: (ctx) => a.slots.some((s) => hasSlot(ctx, s)),
  transform: (ctx) => ({ inputs: a.slots.filter((s) => hasSlot(ctx, s)).map((s) => scale(s, a.factor)), phrase: a.phrase }),
}));

const kSwapped: Hypothesis = {
  id: "k-swapped",
  title: "K₁ and K₂ swapped",
  description: "Each star's projected mass carries the other star's semi-amplitude: M₁ sin³i ∝ (K₁+K₂)²K₂. Swapping K₁ and K₂ swaps the two masses.",
  methods: [DOUBLE],
  applies: (ctx) => hasSlot(ctx, "k1") && hasSlot(ctx, "k2"),
  transform: () => ({ inputs: [{ kind: "swap", slots: ["k1", "k2"] }], phrase: "with K₁ and K₂ swapped" }),
};

// ---------------------------------------------------------------------------
// Eccentricity

const eccentricityOmitted: Hypothesis = {
  id: "eccentricity-factor-omitted",
  title: "(1 − e²)^{3/2} left out",
  description: "The mass function of an eccentric orbit carries (1 − e²)^{3/2}; the published value may have been computed as for a circular orbit.",
  methods: VELOCITY_CURVES,
  applies: (ctx) => (siOf(ctx, "eccentricity") ?? 0) > 0,
  transform: () => ({ inputs: [{ kind: "drop", slot: "eccentricity" }], phrase: "without the factor (1 − e²)^{3/2}" }),
};

// ---------------------------------------------------------------------------
// Angles and distances in the wrong unit

interface UnitSlip {
  readonly id: string;
  readonly title: string;
  readonly description: string;
  readonly methods: readonly string[];
  readonly slots: readonly string[];
  /** Unit the value is typed in. */
  readonly typed: string;
  /** Unit the paper may have taken it for. */
  readonly taken: string;
  readonly phrase: string;
}

const ANGLE_SLOTS = ["angular_semimajor_axis", "angular_radius"];

const UNIT_SLIPS: readonly UnitSlip[] = [
  {
    id: "parallax-mas-as-arcsec",
    title: "Parallax in mas taken as arcsec",
    description: "A parallax in milliarcseconds used as if in arcseconds puts the star 1000 times closer.",
    methods: WITH_DISTANCE, slots: ["parallax"], typed: "mas", taken: "arcsec",
    phrase: "with the parallax in mas read as arcsec",
  },
  {
    id: "parallax-arcsec-as-mas",
    title: "Parallax in arcsec taken as mas",
    description: "A parallax in arcseconds used as if in milliarcseconds puts the star 1000 times farther.",
    methods: WITH_DISTANCE, slots: ["parallax"], typed: "arcsec", taken: "mas",
    phrase: "with the parallax in arcsec read as mas",
  },
  {
    id: "angle-mas-as-arcsec",
    title: "Angular size in mas taken as arcsec",
    description: "An angular semi-major axis or radius in milliarcseconds used as if in arcseconds is 1000 times too large.",
    methods: WITH_DISTANCE, slots: ANGLE_SLOTS, typed: "mas", taken: "arcsec",
    phrase: "with the angle in mas read as arcsec",
  },
  {
    id: "angle-arcsec-as-mas",
    title: "Angular size in arcsec taken as mas",
    description: "An angular semi-major axis or radius in arcseconds used as if in milliarcseconds is 1000 times too small.",
    methods: WITH_DISTANCE, slots: ANGLE_SLOTS, typed: "arcsec", taken: "mas",
    phrase: "with the angle in arcsec read as mas",
  },
  {
    id: "distance-ly-as-pc",
    title: "Distance in light-years taken as parsecs",
    description: "A parsec is 3.26 light-years; a distance in light-years used as parsecs is 3.26 times too large.",
    methods: WITH_DISTANCE, slots: ["distance"], typed: "ly", taken: "pc",
    phrase: "with the distance in ly read as pc",
  },
  {
    id: "distance-pc-as-ly",
    title: "Distance in parsecs taken as light-years",
    description: "A distance in parsecs used as light-years is 3.26 times too small.",
    methods: WITH_DISTANCE, slots: ["distance"], typed: "pc", taken: "ly",
    phrase: "with the distance in pc read as ly",
  },
  {
    id: "distance-kpc-as-pc",
    title: "Distance in kpc taken as pc",
    description: "A distance in kiloparsecs used as parsecs is 1000 times too small.",
    methods: WITH_DISTANCE, slots: ["distance"], typed: "kpc", taken: "pc",
    phrase: "with the distance in kpc read as pc",
  },
  {
    id: "distance-pc-as-kpc",
    title: "Distance in pc taken as kpc",
    description: "A distance in parsecs used as kiloparsecs is 1000 times too large.",
    methods: WITH_DISTANCE, slots: ["distance"], typed: "pc", taken: "kpc",
    phrase: "with the distance in pc read as kpc",
  },
];

const unitHypotheses: Hypothesis[] = UNIT_SLIPS.map((u) => ({
  id: u.id,
  title: u.title,
  description: u.description,
  methods: u.methods,
  applies: (ctx) => u.slots.some((s) => unitOf(ctx, s) === u.typed),
  transform: (ctx) => {
    const factor = unitById(u.taken).scale / unitById(u.typed).scale;
    return { inputs: u.slots.filter((s) => unitOf(ctx, s) === u.typed).map((s) => scale(s, factor)), phrase: u.phrase };
  },
}));

// ---------------------------------------------------------------------------
// Solar radius

const oldSolarRadius: Hypothesis = {
  id: "solar-radius-old",
  title: "Older solar radius for R☉",
  description:
    "Lengths in solar radii convert with the IAU 2015 nominal 6.957 × 10⁸ m; older papers used 6.9599 × 10⁸ m " +
    "(Allen's Astrophysical Quantities, from memory), 0.04 % larger, which moves a mass from a³ by 0.13 %.",
  methods: [RELATIVE, ASTROMETRIC, SINGLE, DOUBLE, CIRCULAR],
  applies: (ctx) =>
    ctx.comparison.published_unit === "R_sun" || Object.values(ctx.record.inputs).some((i) => i.quantity.unit.id === "R_sun"),
  transform: (ctx): Change => {
    const ratio = OLD_SOLAR_RADIUS_M / ctx.constants.R_sun.value;
    const inputs = Object.values(ctx.record.inputs)
      .filter((i) => i.quantity.unit.id === "R_sun")
      .map((i) => scale(i.slot, ratio));
    return {
      inputs,
      phrase: "with R☉ = 6.9599 × 10⁸ m",
      ...(ctx.comparison.published_unit === "R_sun" ? { result: { kind: "factor", factor: 1 / ratio } as const } : {}),
    };
  },
};

// ---------------------------------------------------------------------------
// A mean distance in place of the semi-major axis

/**
 * The time-averaged separation of a Keplerian orbit is a(1 + e²/2) (a standard
 * result of orbital mechanics, e.g. Murray & Dermott 1999, Solar System
 * Dynamics, ch. 2, from memory); a paper that fed that mean distance, or a
 * tabulated mean separation, into Kepler's third law gets a mass larger by
 * (1 + e²/2)³.
 */
const meanDistance: Hypothesis = {
  id: "mean-distance-as-semimajor-axis",
  title: "Mean distance used as the semi-major axis",
  description:
    "The time-averaged separation of an eccentric orbit is a(1 + e²/2); used in Kepler's third law in place of a, " +
    "it inflates the mass by (1 + e²/2)³.",
  methods: [RELATIVE, ASTROMETRIC],
  applies: (ctx) => (siOf(ctx, "eccentricity") ?? 0) > 0 && axisSlot(ctx) !== undefined,
  transform: (ctx) => {
    const e = siOf(ctx, "eccentricity") ?? 0;
    const slot = axisSlot(ctx);
    if (!slot) return undefined;
    return { inputs: [scale(slot, 1 + (e * e) / 2)], phrase: `with the mean distance a(1 + e²/2) = ${short(1 + (e * e) / 2)} a in place of a` };
  },
};

// ---------------------------------------------------------------------------
// Error budget: the distance's uncertainty left out

const distanceSigmaOmitted: Hypothesis = {
  id: "distance-uncertainty-omitted",
  title: "Distance uncertainty left out of the error budget",
  description:
    "A mass from an angular orbit scales as d³, so the distance usually dominates its uncertainty. A published " +
    "uncertainty that matches ours without the parallax or distance term, and is much smaller than ours with it, " +
    "suggests the term was left out. This explains an understated uncertainty, not a different value.",
  methods: WITH_DISTANCE,
  applies: (ctx) =>
    ctx.comparison.sigma_from === "published" &&
    ctx.comparison.published_kind === "measured" &&
    (uncertain(ctx, "parallax") || uncertain(ctx, "distance")),
  transform: (ctx) => ({ omitted: ["parallax", "distance"].filter((s) => uncertain(ctx, s)), phrase: "without the distance term" }),
};

/** Every hypothesis a diagnosis tries. Ids are unique. */
export const HYPOTHESES: readonly Hypothesis[] = Object.freeze([
  ...yearHypotheses,
  daysAsYears,
  yearsAsDays,
  totalAsPrimary,
  smallMassShortcut,
  g2014,
  usedBarycentric,
  usedRelative,
  ...sineHypotheses,
  ...amplitudeHypotheses,
  kSwapped,
  eccentricityOmitted,
  ...unitHypotheses,
  oldSolarRadius,
  meanDistance,
  distanceSigmaOmitted,
]);

{
  const seen = new Set<string>();
  for (const h of HYPOTHESES) {
    if (seen.has(h.id)) throw new Error(`hypothesis ${h.id} is listed twice`);
    seen.add(h.id);
  }
}

export function getHypothesis(id: string): Hypothesis | undefined {
  return HYPOTHESES.find((h) => h.id === id);
}
