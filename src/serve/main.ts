import path from "node:path";
import { serveStatic } from "./static-server.js";

/** `npm run serve`: preview the built site on 127.0.0.1. Arguments: [DIR] [--port N] [--base-path /p/]. */
async function start(argv: string[]): Promise<void> {
  let dir = "_site";
  let port = 8080;
  let basePath = "/";
  for (let i = 0; i < argv.length; i++) {
    if (argv[i] === "--port") port = Number(argv[++i]);
    else if (argv[i] === "--base-path") basePath = argv[++i] ?? "/";
    else dir = argv[i];
  }
  const server = await serveStatic(path.resolve(dir), { port, basePath });
  process.stdout.write(`Serving ${dir} at ${server.url} (Ctrl-C to stop)\n`);
}

start(process.argv.slice(2)).catch((e: unknown) => {
  process.stderr.write(`serve: ${e instanceof Error ? e.message : String(e)}\n`);
  process.exitCode = 1;
});
