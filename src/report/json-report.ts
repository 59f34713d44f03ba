import type { AuditReport } from "../audit/types.js";

/**
 * The text of JSON.stringify(report, null, 2) + "\n", in pieces: the objects
 * one at a time, so a catalogue of a hundred thousand objects never has to be
 * one string (longer than V8 allows) or held whole in memory.
 */
export function* reportJsonChunks(report: AuditReport): Generator<string> {
  const keys = Object.keys(report) as Array<keyof AuditReport>;
  yield "{";
  for (let k = 0; k < keys.length; k++) {
    const key = keys[k];
    const value = report[key];
    yield `${k === 0 ? "" : ","}\n  ${JSON.stringify(key)}: `;
    if (key === "objects" && Array.isArray(value) && value.length > 0) {
      yield "[";
      for (let i = 0; i < value.length; i++) {
        yield `${i === 0 ? "" : ","}\n    ${indent(JSON.stringify(value[i], null, 2), "    ")}`;
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
