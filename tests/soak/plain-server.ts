/**
 * The app's real route handlers (app/**\/route.ts), the import worker and the billing sender in one
 * plain Node process, with no `next build`: what the crash-safety soak kills when no build is at
 * hand (as inside `npm test`). Requests go to the same handler functions Next.js would call.
 *
 *   node --import tsx --import ./tests/soak/register-stubs.mjs tests/soak/plain-server.ts <port>
 */
import http from 'node:http';
import path from 'node:path';
import { Readable } from 'node:stream';
import { routeFiles, type RouteFile } from '../integration/security/routes';

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

interface Compiled {
  route: RouteFile;
  regex: RegExp;
  names: string[];
  /** Static segments first, so `/screenings/preview` wins over `/screenings/[id]`. */
  rank: number;
}

function compile(r: RouteFile): Compiled {
  const names: string[] = [];
  let rank = 0;
  const body = r.pattern
    .split('/')
    .filter(Boolean)
    .map((seg) => {
      const m = /^\[(\.\.\.)?([^\]]+)\]$/.exec(seg);
      if (!m) {
        rank += 2;
        return seg.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
      }
      names.push(m[2]);
      rank += m[1] ? 0 : 1;
      return m[1] ? '(.+)' : '([^/]+)';
    })
    .join('/');
  return { route: r, regex: new RegExp(`^/${body}/?$`), names, rank };
}

const routes = routeFiles()
  .filter((r) => r.pattern.startsWith('/api/'))
  .map(compile)
  .sort((a, b) => b.rank - a.rank);
const loaded = new Map<string, Record<string, Handler | undefined>>();

async function handlerFor(
  pathname: string,
  method: string,
): Promise<{ handler: Handler; params: Record<string, string> } | null> {
  for (const c of routes) {
    const m = c.regex.exec(pathname);
    if (!m) continue;
    let mod = loaded.get(c.route.file);
    if (!mod) {
      mod = (await import(path.join(process.cwd(), c.route.file))) as Record<string, Handler | undefined>;
      loaded.set(c.route.file, mod);
    }
    const handler = mod[method];
    if (!handler) return null;
    return { handler, params: Object.fromEntries(c.names.map((n, i) => [n, decodeURIComponent(m[i + 1])])) };
  }
  return null;
}

async function main(): Promise<void> {
  const port = Number(process.argv[2] ?? 3000);
  const { env } = await import('@/lib/env');
  const e = env();
  // As instrumentation.ts: the background jobs of the app, on the in-process runner.
  await (
    await import('@/lib/jobs/start')
  ).startBackgroundJobs([
    ...(e.IMPORT_WORKER ? (['imports'] as const) : []),
    ...(e.BILLING_SENDER ? (['usage'] as const) : []),
  ]);

  const server = http.createServer((req, res) => {
    void (async () => {
      const url = new URL(req.url ?? '/', `http://127.0.0.1:${port}`);
      if (url.pathname === '/api/health') {
        res.writeHead(200, { 'content-type': 'application/json' }).end('{"ok":true}');
        return;
      }
      const found = await handlerFor(url.pathname, req.method ?? 'GET');
      if (!found) {
        res
          .writeHead(404, { 'content-type': 'application/json' })
          .end('{"error":{"code":"not_found","message":"Not found."}}');
        return;
      }
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers)) if (typeof v === 'string') headers.set(k, v);
      const hasBody = req.method !== 'GET' && req.method !== 'HEAD';
      const request = new Request(url, {
        method: req.method,
        headers,
        body: hasBody ? (Readable.toWeb(req) as ReadableStream) : undefined,
        duplex: 'half',
      } as RequestInit);
      const response = await found.handler(request, { params: Promise.resolve(found.params) });
      res.writeHead(response.status, Object.fromEntries(response.headers));
      res.end(Buffer.from(await response.arrayBuffer()));
    })().catch((err: unknown) => {
      console.error(err);
      if (!res.headersSent) res.writeHead(500, { 'content-type': 'application/json' });
      res.end('{"error":{"code":"internal","message":"internal"}}');
    });
  });
  server.keepAliveTimeout = 5_000;
  server.listen(port, '127.0.0.1', () => console.log(`plain server on http://127.0.0.1:${port}`));
}

void main();
