import { mkdtempSync, mkdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { serveStatic, type StaticServer } from "../../src/serve/static-server.js";

let server: StaticServer;
let root: string;

beforeAll(async () => {
  root = mkdtempSync(path.join(os.tmpdir(), "steelyard-serve-"));
  mkdirSync(path.join(root, "objects", "a"), { recursive: true });
  writeFileSync(path.join(root, "index.html"), "<p>home</p>");
  writeFileSync(path.join(root, "objects", "a", "index.html"), "<p>a</p>");
  writeFileSync(path.join(os.tmpdir(), "steelyard-secret.txt"), "secret");
  server = await serveStatic(root, { basePath: "/sub/" });
});
afterAll(() => server.close());

describe("preview server", () => {
  it("listens on 127.0.0.1 under the base path", async () => {
    expect(server.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/sub\/$/);
    const r = await fetch(server.url);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toContain("text/html");
    expect(await r.text()).toBe("<p>home</p>");
    expect(await (await fetch(server.url + "objects/a/")).text()).toBe("<p>a</p>");
  });

  it("refuses paths outside the base path and outside the root", async () => {
    const origin = new URL(server.url).origin;
    expect((await fetch(origin + "/index.html")).status).toBe(404);
    expect((await fetch(origin + "/sub/%2e%2e/steelyard-secret.txt")).status).toBe(404);
    expect((await fetch(origin + "/sub/..%2f..%2fsteelyard-secret.txt")).status).toBe(404);
  });
});
