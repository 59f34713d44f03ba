import { describe, expect, it } from "vitest";
import { LineIndex } from "../../src/records/line-index.js";

describe("LineIndex", () => {
  it("gives 1-based lines and columns", () => {
    const text = "name: A\nid: b\n\nx: 1";
    const li = new LineIndex(text);
    expect(li.locate(0)).toEqual({ line: 1, column: 1 });
    expect(li.locate(text.indexOf("b"))).toEqual({ line: 2, column: 5 });
    expect(li.locate(text.indexOf("x"))).toEqual({ line: 4, column: 1 });
    expect(li.lineText(2)).toBe("id: b");
    expect(li.lineCount).toBe(4);
  });
  it("counts CRLF as one break and code points as columns", () => {
    const text = "a: 1\r\nb: \u{1F30C} x";
    const li = new LineIndex(text);
    expect(li.locate(text.indexOf("x"))).toEqual({ line: 2, column: 6 });
    expect(li.lineText(1)).toBe("a: 1");
  });
});
