import type { MethodDefinition } from "./method.js";
import { astrometricOrbit } from "./astrometric-orbit.js";
import { circularVelocity } from "./circular-velocity.js";
import { doubleLined } from "./double-lined.js";
import { relativeOrbit } from "./relative-orbit.js";
import { singleLined } from "./single-lined.js";

export * from "./method.js";
export { astrometricOrbit, circularVelocity, doubleLined, relativeOrbit, singleLined };

/** Every mass method, in display order. */
export const METHODS: readonly MethodDefinition[] = Object.freeze([
  relativeOrbit,
  astrometricOrbit,
  singleLined,
  doubleLined,
  circularVelocity,
]);

/** The method names a record may use. */
export const METHOD_IDS: readonly string[] = Object.freeze(METHODS.map((m) => m.id));

const BY_ID = new Map(METHODS.map((m) => [m.id, m] as const));
if (BY_ID.size !== METHODS.length) throw new Error("two methods share an id");

export function getMethod(id: string): MethodDefinition | undefined {
  return BY_ID.get(id);
}
