import type { AuditReport, MeasurementAudit, ResultAudit } from "../audit/types.js";
import { formatMeasured } from "../quantity/format.js";

interface Row {
  readonly cells: readonly string[];
}

const HEADER = ["object", "measurement", "method", "result", "recomputed", "published", "z", "status"];

function recomputedText(r: ResultAudit): string {
  const unit = r.display_unit === "1" ? "" : ` ${r.display_unit}`;
  return `${formatMeasured(r.value, r.sigma, r.sigma, 2)}${unit}`;
}

function rowsFor(objectId: string, m: MeasurementAudit): Row[] {
  const compared = Object.keys(m.comparisons).sort();
  if (compared.length === 0) {
    const first = Object.keys(m.results)[0];
    const r = first ? m.results[first] : undefined;
    return [{ cells: [objectId, m.key, m.method, first ?? "", r ? recomputedText(r) : "", "", "", m.status] }];
  }
  return compared.map((name) => {
    const c = m.comparisons[name];
    const r = m.results[name];
    const z = Number.isFinite(c.z) ? c.z.toFixed(2) : c.z > 0 ? "+inf" : "-inf";
    return { cells: [objectId, m.key, m.method, name, recomputedText(r), c.published_text, z, c.status] };
  });
}

/** The compact table `steelyard check` prints, then every problem, then the counts. */
export function textReport(report: AuditReport): string {
  const rows: Row[] = [];
  for (const o of report.objects) for (const m of o.measurements) rows.push(...rowsFor(o.id, m));
  const widths = HEADER.map((h, i) => Math.max(h.length, ...rows.map((r) => [...r.cells[i]].length)));
  const line = (cells: readonly string[]) =>
    cells.map((c, i) => c + " ".repeat(Math.max(0, widths[i] - [...c].length))).join("  ").trimEnd();
  const out: string[] = [];
  if (rows.length > 0) {
    out.push(line(HEADER));
    out.push(line(widths.map((w) => "-".repeat(w))));
    for (const r of rows) out.push(line(r.cells));
  } else {
    out.push("No measurement could be audited.");
  }
  const causes: string[] = [];
  for (const o of report.objects) {
    for (const m of o.measurements) {
      for (const d of m.diagnoses ?? []) {
        causes.push(`  ${o.id} ${m.key} ${d.result} (${d.status}):`);
        if (d.unexplained) causes.push(`    ${d.summary}`);
        for (const e of d.explained.slice(0, 3)) {
          causes.push(`    - ${e.title}: ${e.description} (z after: ${e.z_after.toFixed(2)})`);
        }
      }
    }
  }
  if (causes.length > 0) out.push("", "Likely causes (single slips that would reconcile the published value):", ...causes);
  if (report.problems.length > 0) {
    out.push("", `Problems (${report.problems.length}):`);
    for (const p of report.problems) {
      const where = `${p.file}:${p.line}:${p.column}`;
      const path = p.path ? ` ${p.path}` : "";
      out.push(`  ${p.severity} ${where}${path}: ${p.message}${p.hint ? ` (hint: ${p.hint})` : ""} [${p.code}]`);
    }
  }
  const s = report.summary;
  const c = s.status_counts;
  out.push(
    "",
    `${s.files} files: ${s.files_audited} audited, ${s.files_with_problems} with problems. ` +
      `${s.measurements} measurements: ${c.consistent} consistent, ${c.tension} tension, ${c.discrepant} discrepant, ${c["not-compared"]} not compared.`,
    "A flag is a prompt to reread the source, not a verdict on it.",
  );
  return out.join("\n") + "\n";
}
