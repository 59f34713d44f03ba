/**
 * A seeded stream of split-normal draws for one uncertain input, filled a block
 * at a time into a Float64Array.
 *
 * Uniform bits come from sfc32 (from the PractRand suite; 128-bit state, the
 * same generator as `Random`), kept in local variables inside the fill loop.
 * Standard normal deviates come from the ziggurat method of Marsaglia & Tsang
 * (2000, "The Ziggurat Method for Generating Random Variables", Journal of
 * Statistical Software 5(8)) with 256 layers and their published R and V (from
 * memory; the layer recursion then closes at the top to 1e-9, which checks
 * them). Each try uses one 32-bit word: its low 8 bits choose the layer and
 * its high 24 bits give a signed uniform in [−1, 1) (resolution 2⁻²³ of the
 * layer width); unlike the published code, the layer bits are not reused in
 * the value. About 98.5 % of tries are accepted at once; the rest go through
 * the exact wedge test or, from the base layer, Marsaglia's (1964) exact tail
 * method.
 *
 * Deterministic for a seed: 32-bit integer arithmetic and IEEE doubles, and
 * Math.exp, Math.log and Math.sqrt in the table and in the rare slow path (the
 * same dependence on the engine's elementary functions as `Random.normal`).
 */

const LAYERS = 256;
const LAYER_MASK = LAYERS - 1;
const LAYER_BITS = 8;
/** Start of the tail, Marsaglia & Tsang (2000), 256 layers. */
const R = 3.6541528853610088;
/** Area of each layer, Marsaglia & Tsang (2000), 256 layers. */
const V = 0.00492867323399;

/** Right edges of the layers: X[0] = V / f(R) (the base strip), X[1] = R, …, X[256] = 0. */
const X = new Float64Array(LAYERS + 1);
/** f(X[i]) = exp(−X[i]²/2). */
const F = new Float64Array(LAYERS + 1);

function density(x: number): number {
  return Math.exp(-0.5 * x * x);
}

X[0] = V / density(R);
X[1] = R;
for (let i = 1; i < LAYERS - 1; i++) X[i + 1] = Math.sqrt(-2 * Math.log(V / X[i] + density(X[i])));
X[LAYERS] = 0;
for (let i = 0; i <= LAYERS; i++) F[i] = density(X[i]);

const TWO_POW_M23 = 2 ** -23;
const TWO_POW_M32 = 2 ** -32;

/** 32-bit FNV-1a hash, as `hashSeed`, kept here so the stream has no other dependency. */
function fnv1a(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** One sfc32 step on the four words of `st` from `at`; returns the output as an unsigned 32-bit integer. */
function step(st: Int32Array, at: number): number {
  const a = st[at];
  const b = st[at + 1];
  const c = st[at + 2];
  const d = st[at + 3];
  const t = (((a + b) | 0) + d) | 0;
  st[at] = b ^ (b >>> 9);
  st[at + 1] = (c + (c << 3)) | 0;
  st[at + 2] = (((c << 21) | (c >>> 11)) + t) | 0;
  st[at + 3] = (d + 1) | 0;
  return t >>> 0;
}

/** Normal deviates made per refill: fixed, so that the sequence does not depend on how many draws each call asks for. */
const CHUNK = 512;

/** Where makeNormals notes the tries it finishes later: scratch shared by every stream (a refill never runs inside another). */
const SLOW_AT = new Int32Array(CHUNK);
const SLOW_WORD = new Int32Array(CHUNK);

export class DrawStream {
  /**
   * Two sfc32 states: [0..4) makes the words of the normal deviates, [4..8) the
   * words that choose the side of a split normal. Held in an Int32Array so
   * that the loops read and write plain 32-bit integers.
   */
  private readonly state = new Int32Array(8);
  /** Standard normal deviates made ahead, used from `next`. */
  private readonly normals = new Float64Array(CHUNK);
  private next = CHUNK;
  /** [plus, −minus] of the current split normal, picked without a branch. */
  private readonly sides = new Float64Array(2);

  /**
   * One stream per (seed, name): the stream of an input depends only on the
   * measurement's seed and the input's slot name, not on which other inputs
   * are drawn or in what order.
   */
  constructor(seed: number, name: string) {
    const key = fnv1a(name) | 0;
    const st = this.state;
    st[0] = 0;
    st[1] = seed | 0;
    st[2] = key;
    st[3] = 1;
    st[4] = 0x9e3779b9 | 0;
    st[5] = seed | 0;
    st[6] = ~key;
    st[7] = 1;
    for (let i = 0; i < 15; i++) {
      this.nextUint32();
      this.sideUint32();
    }
  }

  /** The next word of the normal-deviate generator. */
  nextUint32(): number {
    return step(this.state, 0);
  }

  private sideUint32(): number {
    return step(this.state, 4);
  }

  /** Uniform in (0, 1), 32 random bits, never 0 (for logarithms). */
  private openUniform(): number {
    return (this.nextUint32() + 0.5) * TWO_POW_M32;
  }

  /**
   * The rest of one ziggurat try that fell outside its layer's inner box:
   * `word` is the 32-bit word of the try. Returns the deviate, or NaN when
   * the try is rejected.
   */
  private finishTry(word: number): number {
    const i = word & LAYER_MASK;
    const u = (word >> LAYER_BITS) * TWO_POW_M23;
    if (i === 0) {
      // Marsaglia (1964): exact tail beyond R
      let x: number;
      let y: number;
      do {
        x = -Math.log(this.openUniform()) / R;
        y = -Math.log(this.openUniform());
      } while (y + y < x * x);
      return u < 0 ? -(R + x) : R + x;
    }
    const x = u * X[i];
    const y = F[i] + this.openUniform() * (F[i + 1] - F[i]);
    return y < density(x) ? x : NaN;
  }

  /** A whole ziggurat deviate, trying until one is accepted. */
  private slowNormal(word: number): number {
    let z = this.finishTry(word);
    while (z !== z) {
      const w = this.nextUint32() | 0;
      const i = w & LAYER_MASK;
      z = (w >> LAYER_BITS) * TWO_POW_M23 * X[i];
      if (!(Math.abs(z) < X[i + 1])) z = this.finishTry(w);
    }
    return z;
  }

  /**
   * Makes the next CHUNK deviates z and writes value + scale·z into
   * target[at..at+CHUNK): one word per deviate in a tight loop, then the few
   * tries that fell outside their inner box finished in order. (With value 0
   * and scale 1 this is z itself, exactly.)
   */
  private makeNormals(target: Float64Array, at: number, value: number, scale: number): void {
    const slowAt = SLOW_AT;
    const slowWord = SLOW_WORD;
    let slow = 0;
    const st = this.state;
    let a = st[0];
    let b = st[1];
    let c = st[2];
    let d = st[3];
    for (let j = 0; j < CHUNK; j++) {
      const t = (((a + b) | 0) + d) | 0;
      d = (d + 1) | 0;
      a = b ^ (b >>> 9);
      b = (c + (c << 3)) | 0;
      c = (c << 21) | (c >>> 11);
      c = (c + t) | 0;
      const i = t & LAYER_MASK;
      const z = (t >> LAYER_BITS) * TWO_POW_M23 * X[i];
      target[at + j] = value + scale * z;
      if (!(Math.abs(z) < X[i + 1])) {
        slowAt[slow] = j;
        slowWord[slow] = t;
        slow++;
      }
    }
    st[0] = a;
    st[1] = b;
    st[2] = c;
    st[3] = d;
    for (let k = 0; k < slow; k++) target[at + slowAt[k]] = value + scale * this.slowNormal(slowWord[k]);
  }

  /** One standard normal deviate, from the same sequence as `fill` uses. */
  normal(): number {
    if (this.next === CHUNK) {
      this.makeNormals(this.normals, 0, 0, 1);
      this.next = 0;
    }
    return this.normals[this.next++];
  }

  /**
   * Writes n draws into out[0..n): value + plus·z when plus = minus, with z a
   * standard normal deviate; otherwise a split (two-piece) normal with mode
   * `value`, upper width `plus` and lower width `minus`: |z| on a side chosen
   * with probability proportional to its width (one word of a second
   * generator per draw), so that the density is continuous at the mode.
   * Deviates are made CHUNK at a time, straight into `out` where a whole
   * chunk fits, so the draws do not depend on how n is split between calls.
   */
  fill(out: Float64Array, n: number, value: number, plus: number, minus: number): void {
    if (n > out.length) throw new Error(`DrawStream.fill: ${n} draws do not fit in ${out.length}`);
    const symmetric = plus === minus;
    let j = 0;
    while (j < n) {
      if (this.next === CHUNK && n - j >= CHUNK) {
        if (symmetric) {
          this.makeNormals(out, j, value, plus);
        } else {
          this.makeNormals(out, j, 0, 1);
          this.splitInPlace(out, j, CHUNK, value, plus, minus);
        }
        j += CHUNK;
        continue;
      }
      if (this.next === CHUNK) {
        this.makeNormals(this.normals, 0, 0, 1);
        this.next = 0;
      }
      const start = this.next;
      const take = Math.min(n - j, CHUNK - start);
      const normals = this.normals;
      for (let k = 0; k < take; k++) out[j + k] = normals[start + k];
      if (symmetric) {
        for (let k = j; k < j + take; k++) out[k] = value + plus * out[k];
      } else {
        this.splitInPlace(out, j, take, value, plus, minus);
      }
      this.next = start + take;
      j += take;
    }
  }

  /** Turns standard deviates z in out[at..at+count) into split-normal draws, one side word each. */
  private splitInPlace(out: Float64Array, at: number, count: number, value: number, plus: number, minus: number): void {
    const sides = this.sides;
    sides[0] = plus;
    sides[1] = -minus;
    // the lower side when the word is below this threshold
    const threshold = (minus / (plus + minus)) * 4294967296;
    const st = this.state;
    let e = st[4];
    let f = st[5];
    let g = st[6];
    let h = st[7];
    for (let k = at; k < at + count; k++) {
      const t = (((e + f) | 0) + h) | 0;
      h = (h + 1) | 0;
      e = f ^ (f >>> 9);
      f = (g + (g << 3)) | 0;
      g = (g << 21) | (g >>> 11);
      g = (g + t) | 0;
      const lower = Number((t >>> 0) < threshold); // 0 or 1 without a branch
      out[k] = value + sides[lower] * Math.abs(out[k]);
    }
    st[4] = e;
    st[5] = f;
    st[6] = g;
    st[7] = h;
  }
}

/** The ziggurat's layer edges, for tests: 257 numbers from X[0] = V/f(R) down to X[256] = 0. */
export function zigguratEdges(): Float64Array {
  return X.slice();
}
