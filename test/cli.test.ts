import { execFileSync, spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { main } from "../src/cli.js";

async function run(args: string[]) {
  let out = "";
  let err = "";
  const code = await main(args, { out: (t) => (out += t), err: (t) => (err += t) });
  return { code, out, err };
}

const GOOD = path.resolve("test/fixtures/audit/records");
const BROKEN = path.resolve("test/fixtures/audit/broken");

describe("steelyard check", () => {
  it("prints a table with every measurement and the counts, exit 0 when all is consistent", async () => {
    const r = await run(["check", GOOD, "--draws", "200"]);
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
    for (const key of ["orbit-a", "rv-2020", "eb-2022", "rotation", "wobble"]) expect(r.out).toContain(key);
    expect(r.out).toMatch(/5 files: 5 audited, 0 with problems/);
    expect(r.out).toContain("not a verdict");
  });

  it("prints one JSON document with the contract's fields", async () => {
    const r = await run(["check", GOOD, "--json", "--draws", "200"]);
    const doc = JSON.parse(r.out);
    expect(doc.objects).toHaveLength(5);
    const m = doc.objects.find((o: { id: string }) => o.id === "tarn-14-ab").measurements[0];
    expect(m).toMatchObject({ key: "orbit-a", method: "relative-orbit", status: "consistent" });
    expect(m.results.total_mass.unit_si).toBe("kg");
    expect(m.results.total_mass.value_si).toBeGreaterThan(3.8e30);
    expect(m.results.total_mass.value_si).toBeLessThan(3.95e30);
    expect(typeof m.comparisons.total_mass.published_si).toBe("number");
    expect(typeof m.comparisons.total_mass.z).toBe("number");
    expect(doc.problems).toEqual([]);
  });

  it("exits 2 when a record has problems and lists each with file and line", async () => {
    const r = await run(["check", BROKEN, "--draws", "100"]);
    expect(r.code).toBe(2);
    expect(r.out).toMatch(/unknown-unit\.yaml:7:\d+/);
  });

  it("exits 1 when a result is discrepant, and thresholds are configurable", async () => {
    // 1.951 recomputed vs 1.95 ± 0.04 is z ≈ 0.03: a threshold of 0.01 turns it into discrepant
    const r = await run(["check", GOOD, "--draws", "100", "--tension", "0.001", "--discrepant", "0.01"]);
    expect(r.code).toBe(1);
    expect(r.out).toContain("discrepant");
  });

  it("refuses unknown options and commands with a hint", async () => {
    const a = await run(["check", "--jsn"]);
    expect(a.code).toBe(2);
    expect(a.err).toMatch(/unknown option --jsn/);
    const b = await run(["chek"]);
    expect(b.code).toBe(2);
    expect(b.err).toMatch(/check and build/);
    const c = await run(["check", "--draws", "-3"]);
    expect(c.code).toBe(2);
  });

  it("reports a missing records folder as a problem, not a crash", async () => {
    const r = await run(["check", path.resolve("test/fixtures/does-not-exist")]);
    expect(r.code).toBe(2);
    expect(r.out).toContain("no-records-folder");
  });
});

describe("installed command", () => {
  it("runs through bin/steelyard.js from the compiled code", () => {
    if (!existsSync("dist/cli.js")) execFileSync("npx", ["tsc", "-p", "."], { stdio: "inherit" });
    const r = spawnSync(process.execPath, ["bin/steelyard.js", "check", GOOD, "--json", "--draws", "100"], { encoding: "utf8" });
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).objects).toHaveLength(5);
  });
});
