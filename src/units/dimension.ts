/**
 * A physical dimension as a plain record of exponents.
 *
 * Angle is kept as a dimension of its own (although SI treats the radian as
 * dimensionless) so that an angular semi-major axis can never be mistaken for
 * a linear one.
 */
export interface Dimension {
  readonly length: number;
  readonly mass: number;
  readonly time: number;
  readonly angle: number;
}

const BASES = ["length", "mass", "time", "angle"] as const;
type Base = (typeof BASES)[number];

export function dimension(parts: Partial<Record<Base, number>>): Dimension {
  return Object.freeze({
    length: parts.length ?? 0,
    mass: parts.mass ?? 0,
    time: parts.time ?? 0,
    angle: parts.angle ?? 0,
  });
}

export const DIMENSIONLESS = dimension({});
export const LENGTH = dimension({ length: 1 });
export const MASS = dimension({ mass: 1 });
export const TIME = dimension({ time: 1 });
export const ANGLE = dimension({ angle: 1 });
export const VELOCITY = dimension({ length: 1, time: -1 });
/** Gravitational parameter GM, m³ s⁻². */
export const GRAVITATIONAL_PARAMETER = dimension({ length: 3, time: -2 });

export function sameDimension(a: Dimension, b: Dimension): boolean {
  return BASES.every((k) => a[k] === b[k]);
}

export function multiplyDimensions(a: Dimension, b: Dimension): Dimension {
  return dimension({
    length: a.length + b.length,
    mass: a.mass + b.mass,
    time: a.time + b.time,
    angle: a.angle + b.angle,
  });
}

export function powerDimension(a: Dimension, n: number): Dimension {
  return dimension({ length: a.length * n, mass: a.mass * n, time: a.time * n, angle: a.angle * n });
}

const NAMED: ReadonlyArray<readonly [Dimension, string]> = [
  [DIMENSIONLESS, "dimensionless"],
  [LENGTH, "length"],
  [MASS, "mass"],
  [TIME, "time"],
  [ANGLE, "angle"],
  [VELOCITY, "velocity"],
  [GRAVITATIONAL_PARAMETER, "gravitational parameter (GM)"],
];

const SUPERSCRIPT: Record<string, string> = {
  "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹",
};

/** "length", "velocity", or an exponent form such as "length³·time⁻²". */
export function describeDimension(d: Dimension): string {
  for (const [named, name] of NAMED) if (sameDimension(named, d)) return name;
  return BASES.filter((k) => d[k] !== 0)
    .map((k) => (d[k] === 1 ? k : k + String(d[k]).replace(/./g, (c) => SUPERSCRIPT[c] ?? c)))
    .join("·");
}
