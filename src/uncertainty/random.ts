/**
 * A small, fast, seeded pseudo-random generator (sfc32, from the PractRand
 * suite; 128-bit state) and standard normal deviates by the polar
 * Box–Muller method. Deterministic for a given seed on every platform:
 * only 32-bit integer arithmetic and IEEE doubles are used.
 */
export class Random {
  private a: number;
  private b: number;
  private c: number;
  private d: number;
  private spare = 0;
  private hasSpare = false;

  constructor(seed: number) {
    this.a = 0x9e3779b9;
    this.b = 0x243f6a88;
    this.c = 0xb7e15162;
    this.d = seed >>> 0;
    for (let i = 0; i < 15; i++) this.nextUint32();
  }

  nextUint32(): number {
    const t = (((this.a + this.b) | 0) + this.d) | 0;
    this.d = (this.d + 1) | 0;
    this.a = this.b ^ (this.b >>> 9);
    this.b = (this.c + (this.c << 3)) | 0;
    this.c = (this.c << 21) | (this.c >>> 11);
    this.c = (this.c + t) | 0;
    return t >>> 0;
  }

  /** Uniform in [0, 1), 53 random bits. */
  uniform(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Standard normal deviate. */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    let u: number;
    let v: number;
    let s: number;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    this.spare = v * f;
    this.hasSpare = true;
    return u * f;
  }

  /**
   * Split (two-piece) normal with mode `value`, lower width `minus` and
   * upper width `plus`: each half-normal is chosen with probability
   * proportional to its width, so the density is continuous at the mode.
   */
  splitNormal(value: number, plus: number, minus: number): number {
    if (plus === minus) return value + plus * this.normal();
    const z = Math.abs(this.normal());
    return this.uniform() * (plus + minus) < minus ? value - minus * z : value + plus * z;
  }
}

/** 32-bit FNV-1a hash of a string, used to derive per-measurement seeds. */
export function hashSeed(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}
