import { closeSync, constants, fstatSync, ftruncateSync, mkdirSync, openSync, writeSync } from "node:fs";
import path from "node:path";
import { BufferedFile } from "../cache/buffered-file.js";
import { objectPath } from "./table.js";
import type { PageInput, PageRenderer } from "./page-render.js";

/** What was written for one page: enough to tell next time whether the file is still ours. */
export interface WrittenPage {
  readonly id: string;
  readonly size: number;
  readonly mtimeMs: number;
}

/** The output file of an object's page; objectPath refuses ids that are not slugs, so no page lands outside objects/. */
export function objectPageFile(outDir: string, id: string): string {
  return path.join(outDir, objectPath(id), "index.html");
}

/** Writes text to a file (its folder made if need be) and gives the size and time it then has, for the output manifest. */
export function writeTextFile(file: string, text: string): { size: number; mtimeMs: number } {
  return writeBytesFile(file, Buffer.from(text, "utf8"));
}

/**
 * As writeTextFile, for text in pieces, gathered in `scratch` (a buffer the
 * caller reuses from file to file) and written a buffer at a time.
 */
export function writeChunksFile(file: string, chunks: Iterable<string>, scratch: Buffer): { size: number; mtimeMs: number } {
  return writeFileWith(file, (fd) => {
    const out = new BufferedFile(fd, scratch);
    for (const c of chunks) out.putText(c);
    out.flush();
    return out.offset;
  });
}

/** As writeTextFile, for bytes. */
export function writeBytesFile(file: string, bytes: Uint8Array): { size: number; mtimeMs: number } {
  return writeFileWith(file, (fd) => {
    let off = 0;
    while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
    return off;
  });
}

/** Open for writing from the start, made if missing, and not emptied first (see writeFileWith). */
const OVERWRITE = constants.O_WRONLY | constants.O_CREAT;

/**
 * Makes the file's folder, lets `write` fill the open file from its start
 * (it returns how many bytes it wrote), cuts the file to that length if it
 * was longer, and gives its size and time then.
 *
 * An existing file is written over rather than emptied first: the system
 * then copies into the memory that already holds the file's old pages,
 * instead of freeing them and taking fresh memory for the new ones. On a
 * virtual machine fresh memory is the dear part of writing (in
 * bench/overwrite.mjs a 100 MB file was written over in about 9 ms,
 * against 96 ms after emptying it). The bytes on disk are the same either
 * way; a reader during the write sees old and new bytes mixed rather than a
 * short file, and neither is a whole page.
 */
function writeFileWith(file: string, write: (fd: number) => number): { size: number; mtimeMs: number } {
  mkdirSync(path.dirname(file), { recursive: true });
  const fd = openSync(file, OVERWRITE, 0o666);
  try {
    const length = write(fd);
    let info = fstatSync(fd);
    // only a file that was longer has old bytes left past the new ones (a new page, the usual case, needs no cut)
    if (info.size !== length) {
      ftruncateSync(fd, length);
      info = fstatSync(fd);
    }
    return { size: info.size, mtimeMs: info.mtimeMs };
  } finally {
    closeSync(fd);
  }
}

/** Renders one page and writes it at once (synchronously: a page is small, and waiting on the thread pool per file costs more). */
export function renderAndWrite(render: PageRenderer, input: PageInput, outDir: string): WrittenPage {
  return { id: input.obj.id, ...writeBytesFile(objectPageFile(outDir, input.obj.id), render.bytes(input)) };
}
