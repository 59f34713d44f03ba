import { createReadStream, promises as fs } from "node:fs";
import http from "node:http";
import path from "node:path";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".csv": "text/csv; charset=utf-8",
  ".bib": "text/x-bibtex; charset=utf-8",
  ".xml": "application/xml; charset=utf-8",
  ".vot": "application/x-votable+xml; charset=utf-8",
  ".svg": "image/svg+xml",
  ".png": "image/png",
  ".woff2": "font/woff2",
  ".woff": "font/woff",
  ".ttf": "font/ttf",
  ".txt": "text/plain; charset=utf-8",
};

export interface StaticServer {
  readonly url: string;
  close(): Promise<void>;
}

export interface ServeOptions {
  /** Site base path, e.g. "/" or "/tables/"; requests outside it get 404. */
  readonly basePath?: string;
  readonly port?: number;
}

/**
 * A small static file server for previews and browser tests. It listens on
 * 127.0.0.1 only and never serves a file outside `root`.
 */
export async function serveStatic(root: string, options: ServeOptions = {}): Promise<StaticServer> {
  const base = normaliseBase(options.basePath ?? "/");
  const absRoot = path.resolve(root);
  const server = http.createServer(async (req, res) => {
    try {
      const url = new URL(req.url ?? "/", "http://127.0.0.1");
      let pathname = decodeURIComponent(url.pathname);
      if (!pathname.startsWith(base)) return notFound(res);
      pathname = pathname.slice(base.length - 1);
      let file = path.resolve(absRoot, "." + pathname);
      if (file !== absRoot && !file.startsWith(absRoot + path.sep)) return notFound(res);
      let stat = await fs.stat(file).catch(() => undefined);
      if (stat?.isDirectory()) {
        if (!url.pathname.endsWith("/")) {
          res.writeHead(301, { location: url.pathname + "/" });
          return res.end();
        }
        file = path.join(file, "index.html");
        stat = await fs.stat(file).catch(() => undefined);
      }
      if (!stat?.isFile()) return notFound(res);
      res.writeHead(200, {
        "content-type": TYPES[path.extname(file).toLowerCase()] ?? "application/octet-stream",
        "content-length": stat.size,
      });
      if (req.method === "HEAD") return res.end();
      createReadStream(file).pipe(res);
    } catch {
      notFound(res);
    }
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, "127.0.0.1", () => resolve());
  });
  const address = server.address();
  const port = typeof address === "object" && address ? address.port : 0;
  return {
    url: `http://127.0.0.1:${port}${base}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

function normaliseBase(base: string): string {
  let b = base.startsWith("/") ? base : "/" + base;
  if (!b.endsWith("/")) b += "/";
  return b;
}

function notFound(res: http.ServerResponse): void {
  res.writeHead(404, { "content-type": "text/plain; charset=utf-8" });
  res.end("not found\n");
}
