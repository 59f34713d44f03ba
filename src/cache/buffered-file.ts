import { readSync, writeSync } from "node:fs";

/**
 * Text and bytes gathered into one buffer and written to `fd` whenever the
 * next piece might not fit: a few system calls per megabytes, not one or two
 * per piece. Used for the cache's chunked files and the streamed audit JSON.
 */
export class BufferedFile {
  private readonly buffer: Buffer;
  private used = 0;
  private written = 0;

  /** `buffer`: its size, or a buffer to use (scratch that the caller reuses from file to file, so that new memory is not touched for each). */
  constructor(
    readonly fd: number,
    buffer: number | Buffer = 1 << 22,
  ) {
    this.buffer = typeof buffer === "number" ? Buffer.allocUnsafe(buffer) : buffer;
  }

  /** Bytes so far, written or pending. */
  get offset(): number {
    return this.written + this.used;
  }

  /** Adds text as UTF-8; returns its length in bytes. */
  putText(text: string): number {
    // at most three UTF-8 bytes per UTF-16 code unit
    const most = 3 * text.length;
    if (this.used + most > this.buffer.length) this.flush();
    if (most > this.buffer.length) {
      const bytes = Buffer.from(text, "utf8");
      this.writeAll(bytes);
      return bytes.length;
    }
    const n = this.buffer.write(text, this.used, "utf8");
    this.used += n;
    return n;
  }

  /** Adds bytes. */
  putBytes(bytes: Uint8Array): void {
    if (this.used + bytes.length > this.buffer.length) this.flush();
    if (bytes.length > this.buffer.length) {
      this.writeAll(bytes);
      return;
    }
    this.buffer.set(bytes, this.used);
    this.used += bytes.length;
  }

  /** Adds bytes [at, at + length) of the file `source`; `name` names it in the error when it is shorter. */
  copyFrom(source: number, name: string, at: number, length: number): void {
    let left = length;
    while (left > 0) {
      if (this.used === this.buffer.length) this.flush();
      const n = readSync(source, this.buffer, this.used, Math.min(left, this.buffer.length - this.used), at);
      if (n <= 0) throw new Error(`${name} is shorter than its segments say`);
      this.used += n;
      at += n;
      left -= n;
    }
  }

  /** Writes out what is pending. */
  flush(): void {
    this.writeAll(this.buffer.subarray(0, this.used));
    this.used = 0;
  }

  private writeAll(bytes: Uint8Array): void {
    let off = 0;
    while (off < bytes.length) off += writeSync(this.fd, bytes, off, bytes.length - off);
    this.written += bytes.length;
  }
}
