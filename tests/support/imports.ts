import fs from 'node:fs';
import path from 'node:path';

export const ROOT = path.resolve(import.meta.dirname, '../..');

/** Every .ts, .tsx, .mjs file under `dir` (relative to the repository root), as root-relative paths. */
export function sourceFilesUnder(dir: string): string[] {
  const out: string[] = [];
  const walk = (rel: string): void => {
    for (const entry of fs.readdirSync(path.join(ROOT, rel), { withFileTypes: true })) {
      const child = path.posix.join(rel, entry.name);
      if (entry.isDirectory()) {
        if (entry.name !== 'node_modules' && !entry.name.startsWith('.')) walk(child);
      } else if (/\.(ts|tsx|mjs)$/.test(entry.name)) out.push(child);
    }
  };
  walk(dir);
  return out.sort();
}

// Static imports and re-exports (`import x from`, `import 'x'`, `export { y } from`), dynamic
// `import('x')` and `require('x')`. Comments are removed first so an example in a comment does not count.
const SPECIFIER =
  /(?:\bimport\s+(?:type\s+)?(?:[^'"();]*?\s+from\s+)?|\bexport\s+(?:type\s+)?[^'"();]*?\s+from\s+|\bimport\s*\(\s*|\brequire\s*\(\s*)['"]([^'"]+)['"]/g;

/** The module specifiers a source file imports, in order of appearance. */
export function importSpecifiers(file: string): string[] {
  const text = fs
    .readFileSync(path.join(ROOT, file), 'utf8')
    .replace(/\/\*[\s\S]*?\*\//g, '')
    .replace(/(^|[^:'"`])\/\/.*$/gm, '$1');
  return [...text.matchAll(SPECIFIER)].map((m) => m[1]);
}

/**
 * Where a specifier points: `{ kind: 'file', path }` (root-relative, without extension) for `@/` and
 * relative imports, `{ kind: 'builtin' }` for `node:` modules, `{ kind: 'package', name }` otherwise.
 */
export function resolveSpecifier(
  fromFile: string,
  specifier: string,
): { kind: 'file'; path: string } | { kind: 'builtin' } | { kind: 'package'; name: string } {
  if (specifier.startsWith('node:')) return { kind: 'builtin' };
  if (specifier.startsWith('@/')) return { kind: 'file', path: stripExtension(specifier.slice(2)) };
  if (specifier.startsWith('.')) {
    return {
      kind: 'file',
      path: stripExtension(path.posix.normalize(path.posix.join(path.posix.dirname(fromFile), specifier))),
    };
  }
  const parts = specifier.split('/');
  return { kind: 'package', name: specifier.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0] };
}

function stripExtension(p: string): string {
  return p.replace(/\.(ts|tsx|js|mjs|json)$/, '');
}
