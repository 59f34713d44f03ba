import katex from "katex";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { MAX_MARKERS, markerFor, probeTex, splice, templateOf, texSkeleton } from "../../src/site/tex-skeleton.js";

const OPTIONS = { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" } as const;
const M = markerFor;

/** The skeleton with its markers replaced by the runs again. */
function refill(skeleton: string, runs: readonly string[]): string {
  return skeleton.replace(/9[0-7]{8}8/g, (m) => runs[parseInt(m.slice(1, -1), 8)]);
}

describe("markers", () => {
  it("are ten digits: 9, the index in eight octal digits, 8", () => {
    expect(M(0)).toBe("9000000008");
    expect(M(7)).toBe("9000000078");
    expect(M(8)).toBe("9000000108");
    expect(M(MAX_MARKERS - 1)).toBe("9777777778");
    expect(MAX_MARKERS).toBe(16777216);
  });

  it("refuses indices it cannot write", () => {
    expect(() => M(-1)).toThrow(/whole number/);
    expect(() => M(1.5)).toThrow(/whole number/);
    expect(() => M(MAX_MARKERS)).toThrow(/whole number/);
  });

  it("are found exactly where they were put, whatever digits and markers stand next to them", () => {
    // a marker's only 9 is its first digit, so a search can neither start inside one nor straddle two
    const piece = fc.oneof(
      fc.integer({ min: 0, max: 600 }).map((i) => ({ marker: i })),
      fc.constantFrom("0", "8", "9", ".", "9.", "{", "^{", "\\,").map((text) => ({ text })),
    );
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 12 }), (pieces) => {
        const text = pieces.map((p) => ("marker" in p ? M(p.marker) : p.text)).join("");
        const put = pieces.filter((p) => "marker" in p).map((p) => (p as { marker: number }).marker);
        const found = [...text.matchAll(/9[0-7]{8}8/g)].map((m) => parseInt(m[0].slice(1, -1), 8));
        expect(found).toEqual(put);
      }),
      { numRuns: 2000, seed: 5 },
    );
  });
});

describe("texSkeleton", () => {
  it("marks each number of a substituted value, keeping the base digit of a power of ten", () => {
    const s = texSkeleton("1.581\\times10^{9}\\,\\mathrm{s}");
    // "10^" is the atom "1" followed by the base "0" of the script
    expect(s.skeleton).toBe(`${M(0)}\\times${M(1)}0^{${M(2)}}\\,\\mathrm{s}`);
    expect(s.runs).toEqual(["1.581", "1", "9"]);
  });

  it("leaves signs, units and commands in the skeleton", () => {
    const s = texSkeleton("q = -5.000\\times10^{-7} = \\left(12.34\\,\\mathrm{m^{3}\\,s^{-2}}\\right)");
    expect(s.skeleton).toBe(`q = -${M(0)}\\times${M(1)}0^{-${M(2)}} = \\left(${M(3)}\\,\\mathrm{m^{${M(4)}}\\,s^{-${M(5)}}}\\right)`);
    expect(s.runs).toEqual(["5.000", "1", "7", "12.34", "3", "2"]);
  });

  it("gives two equations of one shape the same skeleton, and a minus a shape of its own", () => {
    const a = texSkeleton("a = \\left(2.5\\times10^{3}\\,\\mathrm{m}\\right) = 0");
    const b = texSkeleton("a = \\left(7.123456\\times10^{301}\\,\\mathrm{m}\\right) = 1234");
    expect(a.skeleton).toBe(b.skeleton);
    expect(b.runs).toEqual(["7.123456", "1", "301", "1234"]);
    expect(texSkeleton("a = \\left(2.5\\times10^{-3}\\,\\mathrm{m}\\right) = 0").skeleton).not.toBe(a.skeleton);
  });

  it("keeps the digit an unbraced script takes, and the one a script or prime sits on", () => {
    expect(texSkeleton("x^23")).toEqual({ skeleton: `x^2${M(0)}`, runs: ["3"] });
    expect(texSkeleton("x_ 1")).toEqual({ skeleton: "x_ 1", runs: [] });
    expect(texSkeleton("12 ^{3}")).toEqual({ skeleton: `${M(0)}2 ^{${M(1)}}`, runs: ["1", "3"] });
    expect(texSkeleton("1.5^{2}")).toEqual({ skeleton: `${M(0)}.5^{${M(1)}}`, runs: ["1", "2"] });
    expect(texSkeleton("2'")).toEqual({ skeleton: "2'", runs: [] });
    expect(texSkeleton("{12}^{2}")).toEqual({ skeleton: `{${M(0)}}^{${M(1)}}`, runs: ["12", "2"] });
  });

  it("takes at most one decimal point between digits into a number", () => {
    expect(texSkeleton("1.2.3")).toEqual({ skeleton: `${M(0)}.${M(1)}`, runs: ["1.2", "3"] });
    expect(texSkeleton(".5")).toEqual({ skeleton: `.${M(0)}`, runs: ["5"] });
    expect(texSkeleton("5.")).toEqual({ skeleton: `${M(0)}.`, runs: ["5"] });
  });

  it("never reads digits out of control sequences", () => {
    // \\ is a control symbol; the digits after it are a number
    expect(texSkeleton("a\\\\12")).toEqual({ skeleton: `a\\\\${M(0)}`, runs: ["12"] });
    // \1 is a control symbol of its own
    expect(texSkeleton("\\1 2")).toEqual({ skeleton: `\\1 ${M(0)}`, runs: ["2"] });
    expect(texSkeleton("\\,3\\;4")).toEqual({ skeleton: `\\,${M(0)}\\;${M(1)}`, runs: ["3", "4"] });
  });

  it("returns TeX without digits unchanged", () => {
    expect(texSkeleton("\\mathcal{G}M_{\\odot} = \\frac{a}{b}")).toEqual({ skeleton: "\\mathcal{G}M_{\\odot} = \\frac{a}{b}", runs: [] });
  });

  it("loses nothing: the runs put back into the markers give the TeX again", () => {
    const atom = fc.constantFrom("0", "1", "9", "12", "3.5", ".", " ", "^", "_", "'", "{", "}", "\\", "\\\\", "\\times", "\\,", "x", "-", "8", "90000000");
    fc.assert(
      fc.property(fc.array(atom, { maxLength: 20 }), (atoms) => {
        const tex = atoms.join("");
        const { skeleton, runs } = texSkeleton(tex);
        expect(refill(skeleton, runs)).toBe(tex);
        // outside markers and control sequences, the skeleton keeps only the digits scripts take or sit on:
        // at most two in a row (as in ^00', a superscript 0 and a primed 0)
        expect(skeleton.replace(/\\(?:[a-zA-Z@]+|[^])?/g, " ").replace(/9[0-7]{8}8/g, " ").match(/\d{3}/g)).toBeNull();
      }),
      { numRuns: 3000, seed: 3 },
    );
  });

  it("makes the one-digit probe of a skeleton", () => {
    const { skeleton } = texSkeleton("1.581\\times10^{9}");
    expect(probeTex(skeleton, "1")).toBe("1\\times10^{1}");
  });
});

describe("templateOf and splice", () => {
  it("cuts a typeset skeleton at its markers, once in the MathML, the annotation and the HTML", () => {
    const { skeleton, runs } = texSkeleton("P = 1.581\\times10^{9}\\,\\mathrm{s}");
    const t = templateOf(katex.renderToString(skeleton, OPTIONS), runs.length);
    expect(t.ok).toBe(true);
    if (!t.ok) return;
    expect(t.value.slots).toEqual([0, 1, 2, 0, 1, 2, 0, 1, 2]);
    expect(t.value.pieces.length).toBe(10);
    expect(splice(t.value, runs)).toBe(katex.renderToString("P = 1.581\\times10^{9}\\,\\mathrm{s}", OPTIONS));
    expect(splice(t.value, ["0.5", "1", "12"])).toBe(katex.renderToString("P = 0.5\\times10^{12}\\,\\mathrm{s}", OPTIONS));
  });

  it("splices by pasting the runs between the pieces", () => {
    expect(splice({ pieces: ["<a>", "|", "</a>"], slots: [1, 0] }, ["x", "y"])).toBe("<a>y|x</a>");
    expect(splice({ pieces: ["whole"], slots: [] }, [])).toBe("whole");
  });

  const refusal = (tex: string, renderedRuns?: number): string => {
    const { skeleton, runs } = texSkeleton(tex);
    const t = templateOf(katex.renderToString(skeleton, OPTIONS), renderedRuns ?? runs.length);
    return t.ok ? "accepted" : t.reason;
  };

  it("refuses a number that became a size", () => {
    expect(refusal("\\kern1.5em x")).toMatch(/part of a tag/);
  });

  it("refuses a number split by an argument", () => {
    expect(refusal("\\frac12")).toMatch(/appears 0 times in the mathml part/);
  });

  it("refuses a number set in italic digits", () => {
    expect(refusal("\\mathit{12}")).toMatch(/class mathit/);
    expect(refusal("\\mathfrak{12}")).toMatch(/class mathfrak/);
  });

  it("refuses output with a marker it did not expect, or without one it did", () => {
    expect(refusal("x = 12", 0)).toMatch(/marker-like number/);
    expect(refusal("x = 12", 2)).toMatch(/number 1 appears 0 times/);
  });

  it("refuses output without a TeX annotation", () => {
    const html = katex.renderToString(M(0), { ...OPTIONS, output: "html" });
    const t = templateOf(html, 1);
    expect(t.ok ? "accepted" : t.reason).toMatch(/annotation/);
  });
});
