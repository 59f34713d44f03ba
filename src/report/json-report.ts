import type { AuditReport, ObjectAudit } from "../audit/types.js";

/**
 * The text of JSON.stringify(report, null, 2) + "\n", in pieces: the objects
 * one at a time, so a catalogue of a hundred thousand objects never has to be
 * one string (longer than V8 allows) or held whole in memory.
 */
const WRAP_HEAD = '{\n  "objects": [\n    ';
const WRAP_TAIL = "\n  ]\n}";

/**
 * One object's text in the report: its JSON.stringify(obj, null, 2) at the
 * depth of the "objects" array, every line after the first four spaces in.
 * JSON.stringify indents it so itself when it sits there, so the text is cut
 * out of { "objects": [obj] } stringified: one pass, no second one to indent.
 */
export function objectJsonText(obj: ObjectAudit): string {
  const text = JSON.stringify({ objects: [obj] }, null, 2);
  return text.slice(WRAP_HEAD.length, text.length - WRAP_TAIL.length);
}

/**
 * The chunks; `textOf` gives an object's text (objectJsonText) when it was
 * made already, on the thread that audited it, as a string or as its UTF-8
 * bytes (a chunk then is those bytes, written as they are: at ten thousand
 * objects, decoding a worker's bytes only to encode them again for the output
 * was most of what `check --json` did after the audit).
 */
export function* reportJsonChunks(
  report: AuditReport,
  textOf?: (obj: ObjectAudit) => string | Uint8Array | undefined,
): Generator<string | Uint8Array> {
  const keys = Object.keys(report) as Array<keyof AuditReport>;
  yield "{";
  for (let k = 0; k < keys.length; k++) {
    const key = keys[k];
    const value = report[key];
    yield `${k === 0 ? "" : ","}\n  ${JSON.stringify(key)}: `;
    if (key === "objects" && Array.isArray(value) && value.length > 0) {
      yield "[";
      for (let i = 0; i < value.length; i++) {
        const obj = value[i] as ObjectAudit;
        const text = textOf?.(obj) ?? objectJsonText(obj);
        if (typeof text === "string") {
          yield `${i === 0 ? "" : ","}\n    ${text}`;
        } else {
          yield i === 0 ? "\n    " : ",\n    ";
          yield text;
        }
      }
      yield "\n  ]";
    } else {
      yield indent(JSON.stringify(value, null, 2), "  ");
    }
  }
  yield "\n}\n";
}

function indent(text: string, pad: string): string {
  return text.includes("\n") ? text.replace(/\n/g, "\n" + pad) : text;
}
