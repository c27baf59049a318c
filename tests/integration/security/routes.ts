import fs from 'node:fs';
import path from 'node:path';

/** Route files, found by walking the tree so that a new one cannot be missed. */
const ROOT = process.cwd();
export const HTTP_METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;
export type HttpMethod = (typeof HTTP_METHODS)[number];

export function walk(dir: string, out: string[] = []): string[] {
  if (!fs.existsSync(dir)) return out;
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    if (entry.name === 'node_modules' || entry.name.startsWith('.')) continue;
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) walk(full, out);
    else out.push(full);
  }
  return out;
}

export interface RouteFile {
  /** Relative to the repository, e.g. `app/api/v1/workspaces/[slug]/screenings/route.ts`. */
  file: string;
  /** URL pattern with route groups removed, e.g. `/api/v1/workspaces/[slug]/screenings`. */
  pattern: string;
  /** Dynamic segment names in order, e.g. `['slug', 'id']`. */
  params: string[];
  /** True when the URL is inside one workspace (`[slug]`). */
  inWorkspace: boolean;
}

export function routeFiles(): RouteFile[] {
  return walk(path.join(ROOT, 'app'))
    .filter((f) => /\/route\.(ts|tsx|js)$/.test(f))
    .map((abs) => {
      const file = path.relative(ROOT, abs);
      const segments = path
        .dirname(file)
        .split(path.sep)
        .slice(1)
        .filter((s) => !/^\(.*\)$/.test(s));
      const params = segments.filter((s) => /^\[.+\]$/.test(s)).map((s) => s.replace(/^\[+\.{0,3}|\]+$/g, ''));
      return {
        file,
        pattern: `/${segments.join('/')}`,
        params,
        inWorkspace: params.includes('slug') || params.includes('workspace'),
      };
    })
    .sort((a, b) => a.file.localeCompare(b.file));
}

export type RouteModule = Partial<
  Record<
    HttpMethod,
    ((req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>) & { permission?: string }
  >
>;

export async function loadRoute(r: RouteFile): Promise<RouteModule> {
  return (await import(/* @vite-ignore */ path.join(ROOT, r.file))) as RouteModule;
}

/** Fills a pattern's dynamic segments. */
export function fillPattern(pattern: string, values: Record<string, string>): string {
  return pattern.replace(/\[+\.{0,3}([^\]]+)\]+/g, (_, name: string) => encodeURIComponent(values[name] ?? 'x'));
}
