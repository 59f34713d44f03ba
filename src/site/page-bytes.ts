import { randomBytes } from "node:crypto";
import { encodedPiecesOf, renderTex, typesetEquation, type TypesetEquation } from "./katex.js";

/** How many repeating equations are kept (a site has a few dozen: one per method and combination of inputs). */
const REPEATED_LIMIT = 1024;

/**
 * An object page as UTF-8 bytes, put together without making its equations
 * into strings.
 *
 * Typeset equations are about three quarters of an object page, and each is
 * its shape's template with other numbers in it (see katex.ts). Rendered as
 * text, every page pastes the templates' pieces into one long string, which
 * V8 then flattens and encodes as UTF-8 byte by byte. Instead, the page is
 * rendered with a short placeholder where each display equation goes; the
 * bytes are then the page's own text, encoded, with each equation's pieces
 * copied in from their UTF-8 form (encoded once per template) and its
 * numbers written between them. The result is the same bytes as the text
 * encoded whole.
 *
 * A placeholder is a private-use character, a random tag made once per
 * process, the equation's number and a second private-use character. The
 * page is used only when every equation's placeholder appears once, in order,
 * and no other placeholder does; otherwise (a record's text holding the tag,
 * say) the caller renders the page as text.
 */
export class PageBytes {
  private readonly open = `\ue000${randomBytes(6).toString("hex")}#`;
  private equations: Array<TypesetEquation | Buffer> = [];
  private scratch = Buffer.allocUnsafe(1 << 20);
  /** Equations that repeat from page to page (a method's general form): their UTF-8, by their TeX. */
  private readonly repeated = new Map<string, Buffer>();

  /** Starts a page: forgets the equations of the last one. */
  begin(): void {
    this.equations = [];
  }

  /**
   * The placeholder of a display equation on this page. With `repeats`, the
   * equation is one that many pages show as it is: its bytes are kept, and
   * found again by its TeX rather than cut into numbers and spliced again.
   */
  displayEquation(tex: string, repeats = false): string {
    const k = this.equations.length;
    if (repeats) {
      let bytes = this.repeated.get(tex);
      if (bytes === undefined) {
        bytes = Buffer.from(renderTex(tex, true), "utf8");
        if (this.repeated.size >= REPEATED_LIMIT) this.repeated.clear();
        this.repeated.set(tex, bytes);
      }
      this.equations.push(bytes);
    } else this.equations.push(typesetEquation(tex, true));
    return `${this.open}${k}\ue001`;
  }

  /**
   * The bytes of the rendered page `page`, with its equations in place; a
   * view of a buffer that the next call reuses. Undefined when the
   * placeholders are not exactly this page's, once each and in order.
   */
  assemble(page: string): Uint8Array | undefined {
    const open = this.open;
    let used = 0;
    let from = 0;
    for (let k = 0; k < this.equations.length; k++) {
      const at = page.indexOf(open, from);
      const mark = `${open}${k}\ue001`;
      if (at < 0 || !page.startsWith(mark, at)) return undefined;
      used = this.text(page.slice(from, at), used);
      used = this.equation(this.equations[k], used);
      from = at + mark.length;
    }
    if (page.indexOf(open, from) >= 0) return undefined;
    used = this.text(from === 0 ? page : page.slice(from), used);
    return this.scratch.subarray(0, used);
  }

  /** Makes room for `more` bytes after `used`. */
  private room(used: number, more: number): void {
    if (used + more <= this.scratch.length) return;
    const bigger = Buffer.allocUnsafe(Math.max(2 * this.scratch.length, used + more));
    this.scratch.copy(bigger, 0, 0, used);
    this.scratch = bigger;
  }

  private text(text: string, used: number): number {
    // at most three UTF-8 bytes per UTF-16 code unit
    this.room(used, 3 * text.length);
    return used + this.scratch.write(text, used, "utf8");
  }

  private bytes(bytes: Buffer, used: number): number {
    this.room(used, bytes.length);
    this.scratch.set(bytes, used);
    return used + bytes.length;
  }

  private equation(eq: TypesetEquation | Buffer, used: number): number {
    if (Buffer.isBuffer(eq)) return this.bytes(eq, used);
    if (eq.kind === "whole") return this.text(eq.html, used);
    const pieces = encodedPiecesOf(eq.template);
    const slots = eq.template.slots;
    let at = this.bytes(pieces[0], used);
    for (let i = 0; i < slots.length; i++) {
      // the numbers are ASCII digits and points
      const run = eq.runs[slots[i]];
      this.room(at, run.length);
      at += this.scratch.write(run, at, "latin1");
      at = this.bytes(pieces[i + 1], at);
    }
    return at;
  }
}
