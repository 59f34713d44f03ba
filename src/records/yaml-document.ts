/**
 * The one adapter around the YAML parser. It turns a record's text into a
 * plain value plus an index from field path to the line and column of each
 * key and value, and turns every parser failure into a located problem.
 *
 * Safety: the parser's core schema only (null, booleans, numbers, strings,
 * lists, mappings; any explicit custom tag fails), duplicate keys are errors,
 * and aliases are refused outright — they are reported from the event stream
 * before anything is built, and `maxAliases: 0` stops the builder as well — so
 * an alias bomb costs no more than reading its text.
 */
import { createRequire } from "node:module";
import type * as JsYaml from "js-yaml";
import type { Location } from "./types.js";
import { LineIndex } from "./line-index.js";
import { childPath, itemPath } from "./field-path.js";
import { WHOLE_FILE, type NewProblem } from "./problem-list.js";

const require = createRequire(import.meta.url);
// The CommonJS build loads faster than the ES module build.
const yaml = require("js-yaml") as typeof JsYaml;

const EV = yaml.EVENT_ID;
const SCALAR_STYLE = yaml.SCALAR_STYLE;

/** Deepest nesting of lists and mappings accepted; records need four levels. */
export const MAX_DEPTH = 50;

export interface PositionEntry {
  /** Where the key is, for values inside a mapping. */
  readonly key?: Location;
  /** Where the value starts (its first character; the indicator of a block scalar). */
  readonly value: Location;
}

export interface YamlDocument {
  readonly value: unknown;
  /** Field path ("measurements[0].inputs.period", "" for the top level) → position. */
  readonly positions: ReadonlyMap<string, PositionEntry>;
}

export type YamlOutcome =
  | { readonly ok: true; readonly document: YamlDocument }
  | { readonly ok: false; readonly problems: readonly NewProblem[] };

interface Frame {
  readonly kind: "mapping" | "sequence" | "skip";
  readonly path: string;
  index: number;
  expectKey: boolean;
  pendingKey?: { text: string; location: Location };
  readonly keys: Map<string, Location>;
}

/** Parses one YAML document. `text` must already be decoded (no byte-order mark). */
export function parseYamlDocument(text: string): YamlOutcome {
  const lines = new LineIndex(text);

  let events: JsYaml.Event[];
  try {
    events = yaml.parseEvents(text, { maxDepth: MAX_DEPTH });
  } catch (e) {
    return { ok: false, problems: [parserProblem(e, text, lines)] };
  }

  const documents = events.filter((e) => e.type === EV.DOCUMENT).length;
  const contentEvents = events.filter((e) => e.type !== EV.DOCUMENT && e.type !== EV.POP).length;
  if (documents === 0 || contentEvents === 0) {
    return {
      ok: false,
      problems: [{
        code: "empty-file",
        path: "",
        location: WHOLE_FILE,
        message: "the file holds no record (it is empty or only comments)",
        hint: "write one object with at least 'name' and 'measurements', or delete the file",
      }],
    };
  }
  if (documents > 1) {
    return {
      ok: false,
      problems: [{
        code: "multiple-documents",
        path: "",
        location: secondDocumentLocation(events, text, lines),
        message: `the file holds ${documents} YAML documents; a record file holds exactly one`,
        hint: "put each object in a file of its own and remove the '---' separators",
      }],
    };
  }

  const walked = indexPositions(events, text, lines);
  if (walked.problems.length > 0) return { ok: false, problems: walked.problems };

  let value: unknown;
  try {
    const docs = yaml.constructFromEvents(events, { source: text, schema: yaml.CORE_SCHEMA, maxAliases: 0 });
    value = docs[0];
  } catch (e) {
    const problem = parserProblem(e, text, lines);
    return { ok: false, problems: [{ ...problem, path: pathAt(walked.positions, problem.location) }] };
  }
  return { ok: true, document: { value, positions: walked.positions } };
}

function eventOffset(e: JsYaml.Event): number {
  switch (e.type) {
    case EV.MAPPING:
    case EV.SEQUENCE:
      return e.start;
    case EV.SCALAR:
      return e.valueStart;
    case EV.ALIAS:
      return e.anchorStart - 1;
    default:
      return -1;
  }
}

/** A node starts at its anchor ("&name") or tag ("!!str") when it has one, else at `offset`. */
function nodeStart(e: JsYaml.Event, offset: number): number {
  if (e.type !== EV.SCALAR && e.type !== EV.MAPPING && e.type !== EV.SEQUENCE) return offset;
  const starts = [offset, e.anchorStart >= 0 ? e.anchorStart - 1 : -1, e.tagStart].filter((o) => o >= 0);
  return starts.length > 0 ? Math.min(...starts) : offset;
}

/** Where a scalar starts: its opening quote, or the '|' / '>' indicator of a block scalar rather than its first content line. */
function scalarOffset(e: JsYaml.ScalarEvent, text: string): number {
  if (e.valueStart < 0) return -1;
  // quoted scalars: the event starts inside the quotes
  if (e.style === SCALAR_STYLE.SINGLE_QUOTED || e.style === SCALAR_STYLE.DOUBLE_QUOTED) return Math.max(0, e.valueStart - 1);
  if (e.style !== SCALAR_STYLE.LITERAL_BLOCK && e.style !== SCALAR_STYLE.FOLDED_BLOCK) return e.valueStart;
  const indicator = e.style === SCALAR_STYLE.LITERAL_BLOCK ? "|" : ">";
  const found = text.lastIndexOf(indicator, e.valueStart - 1);
  return found >= 0 ? found : e.valueStart;
}

interface Walked {
  readonly positions: Map<string, PositionEntry>;
  readonly problems: NewProblem[];
}

/** One pass over the events: positions of every key and value, duplicate keys, aliases, complex keys. */
function indexPositions(events: readonly JsYaml.Event[], text: string, lines: LineIndex): Walked {
  const positions = new Map<string, PositionEntry>();
  const problems: NewProblem[] = [];
  const stack: Frame[] = [];
  let aliases = 0;
  let firstAlias: NewProblem | undefined;

  const advance = () => {
    const top = stack[stack.length - 1];
    if (!top) return;
    if (top.kind === "mapping") {
      top.expectKey = true;
      top.pendingKey = undefined;
    } else if (top.kind === "sequence") top.index++;
  };

  for (const e of events) {
    if (e.type === EV.DOCUMENT) continue;
    if (e.type === EV.POP) {
      if (stack.length === 0) continue;
      const popped = stack.pop()!;
      // a skipped complex key is followed by its value
      if (popped.kind === "skip" && popped.index === -1) continue;
      advance();
      continue;
    }

    const top = stack[stack.length - 1];
    const offset = nodeStart(e, e.type === EV.SCALAR ? scalarOffset(e, text) : eventOffset(e));

    if (e.type === EV.ALIAS) {
      const name = text.slice(e.anchorStart, e.anchorEnd);
      aliases++;
      if (!firstAlias) {
        firstAlias = {
          code: "alias-not-allowed",
          path: top ? currentPath(top) : "",
          location: lines.locate(offset),
          message: `YAML alias '*${name}' is not allowed in records`,
          hint: "write the value out in full; aliases are refused so that a small file cannot expand into a huge one",
        };
      }
      if (top && top.kind === "mapping" && top.expectKey) {
        top.expectKey = false;
        top.pendingKey = { text: `*${name}`, location: lines.locate(offset) };
      } else advance();
      continue;
    }

    if (top && top.kind === "skip") {
      if (e.type !== EV.SCALAR) stack.push({ kind: "skip", path: top.path, index: 0, expectKey: false, keys: new Map() });
      continue;
    }

    if (top && top.kind === "mapping" && top.expectKey) {
      const location = lines.locate(offset);
      if (e.type !== EV.SCALAR) {
        problems.push({
          code: "complex-key",
          path: top.path,
          location,
          message: "a mapping key must be a plain word, not a list or a mapping",
          hint: "use a plain field name such as 'period'",
        });
        top.expectKey = false;
        top.pendingKey = { text: "?", location };
        // skip the key's own contents; index -1 marks "the value comes next"
        stack.push({ kind: "skip", path: top.path, index: -1, expectKey: false, keys: new Map() });
        continue;
      }
      const keyText = yaml.getScalarValue(text, e);
      const first = top.keys.get(keyText);
      if (first) {
        problems.push({
          code: "duplicate-key",
          path: childPath(top.path, keyText),
          location,
          message: `key '${keyText}' appears twice in the same mapping (first on line ${first.line})`,
          hint: "keep one of the two entries; YAML does not allow a key twice",
        });
      } else top.keys.set(keyText, location);
      top.expectKey = false;
      top.pendingKey = { text: keyText, location };
      continue;
    }

    // a value: the top level, a list item or a mapping value
    const path = top ? currentPath(top) : "";
    const value = offset >= 0 ? lines.locate(offset) : top?.pendingKey?.location ?? { line: 1, column: 1 };
    const entry: PositionEntry = top?.kind === "mapping" && top.pendingKey ? { key: top.pendingKey.location, value } : { value };
    if (!positions.has(path)) positions.set(path, entry);

    if (e.type === EV.MAPPING) {
      stack.push({ kind: "mapping", path, index: 0, expectKey: true, keys: new Map() });
    } else if (e.type === EV.SEQUENCE) {
      stack.push({ kind: "sequence", path, index: 0, expectKey: false, keys: new Map() });
    } else {
      advance();
    }
  }
  if (firstAlias) {
    // one problem for all of them: an alias bomb has hundreds
    problems.push(aliases === 1 ? firstAlias : { ...firstAlias, message: `${firstAlias.message} (${aliases} aliases in this file)` });
  }
  return { positions, problems };
}

/** The deepest field whose key or value starts at `at`; "" when none does. */
function pathAt(positions: ReadonlyMap<string, PositionEntry>, at: Location): string {
  let best = "";
  const same = (l: Location | undefined) => l !== undefined && l.line === at.line && l.column === at.column;
  for (const [path, entry] of positions) {
    if ((same(entry.value) || same(entry.key)) && path.length > best.length) best = path;
  }
  return best;
}

function currentPath(frame: Frame): string {
  if (frame.kind === "sequence") return itemPath(frame.path, frame.index);
  if (frame.kind === "mapping") return childPath(frame.path, frame.pendingKey?.text ?? "");
  return frame.path;
}

/** The '---' line that opens the second document, or the first content of that document. */
function secondDocumentLocation(events: readonly JsYaml.Event[], text: string, lines: LineIndex): Location {
  let seen = 0;
  let firstContent = -1;
  let explicitStart = false;
  for (const e of events) {
    if (e.type === EV.DOCUMENT) {
      seen++;
      if (seen === 2) explicitStart = e.explicitStart;
      continue;
    }
    if (seen === 2 && e.type !== EV.POP) {
      firstContent = eventOffset(e);
      if (firstContent >= 0) break;
    }
  }
  const markers: number[] = [];
  const re = /^---(?=[ \t\r\n]|$)/gm;
  for (let m = re.exec(text); m; m = re.exec(text)) markers.push(m.index);
  if (explicitStart) {
    const before = firstContent >= 0 ? markers.filter((o) => o <= firstContent) : markers;
    if (before.length > 0) return lines.locate(before[before.length - 1]);
  }
  if (firstContent >= 0) return lines.locate(firstContent);
  return markers.length > 0 ? lines.locate(markers[markers.length - 1]) : WHOLE_FILE;
}

interface MarkedError {
  reason?: unknown;
  message?: unknown;
  mark?: { position?: number; line?: number; column?: number };
}

/** A parser failure as a problem, located by the parser's mark. */
function parserProblem(error: unknown, text: string, lines: LineIndex): NewProblem {
  const e = (error ?? {}) as MarkedError;
  const reason = typeof e.reason === "string" ? e.reason : typeof e.message === "string" ? e.message : String(error);
  let location: Location = WHOLE_FILE;
  if (e.mark && typeof e.mark.position === "number") location = lines.locate(e.mark.position);
  else if (e.mark && typeof e.mark.line === "number") location = { line: e.mark.line + 1, column: (e.mark.column ?? 0) + 1 };

  if (location.line > 0) {
    const lineText = lines.lineText(location.line);
    const indent = /^[ \t]*/.exec(lineText)![0];
    const tab = indent.indexOf("\t");
    if (tab >= 0 || /\btab\b/i.test(reason)) {
      return {
        code: "tab-indent",
        path: "",
        location: { line: location.line, column: tab >= 0 ? tab + 1 : location.column },
        message: "a tab character is used for indentation; YAML indents with spaces only",
        hint: "replace the tabs at the start of this line with spaces",
      };
    }
  }
  if (/duplicat/i.test(reason)) {
    return { code: "duplicate-key", path: "", location, message: `duplicate key: ${reason}`, hint: "keep one of the two entries" };
  }
  if (/maxAliases|alias/i.test(reason)) {
    return {
      code: "alias-not-allowed",
      path: "",
      location,
      message: "YAML aliases are not allowed in records",
      hint: "write the value out in full",
    };
  }
  if (/unknown .*tag|unknown tag/i.test(reason)) {
    return {
      code: "unknown-tag",
      path: "",
      location,
      message: `${reason}; records use plain YAML without tags`,
      hint: "remove the '!' tag and write the value plainly (quote it to make it a string)",
    };
  }
  if (/depth/i.test(reason)) {
    return {
      code: "too-deep",
      path: "",
      location,
      message: `lists and mappings are nested too deeply (more than ${MAX_DEPTH} levels)`,
      hint: "records need only a few levels of nesting",
    };
  }
  return {
    code: "yaml-syntax",
    path: "",
    location,
    message: `YAML syntax error: ${reason}`,
    hint: "check the indentation and the quoting on this line and the one above; quote any text that contains ': ' or ' #'",
  };
}
