import { describe, expect, it } from 'vitest';
import { importSpecifiers, resolveSpecifier, sourceFilesUnder } from '../../support/imports';

/**
 * `db/` holds queries; rules (the billing gate, engine work, tokens) live in services under `lib/`
 * that own the write transaction. So `db/` may import only leaf utilities from `lib/`.
 */
/** Leaf utilities: errors, clock, units, and plain data with no imports (roles, the plan catalogue). */
const LEAF_UTILITIES = ['lib/errors', 'lib/clock', 'lib/units', 'lib/auth/roles', 'lib/billing/plan-catalogue'];

/**
 * Imports from `lib/` that `db/` still has, each to be moved into a service. The list may only
 * shrink: an entry that no longer exists fails too, so it is struck when the move is done.
 */
const NOT_YET_MOVED = [
  'db/imports.ts -> lib/billing/gate',
  'db/imports.ts -> lib/screening',
  'db/imports.ts -> lib/validation/imports',
  'db/imports.ts -> lib/imports/schedule',
];

function dbImportsOfLib(): string[] {
  const found = new Set<string>();
  for (const file of sourceFilesUnder('db')) {
    for (const spec of importSpecifiers(file)) {
      const target = resolveSpecifier(file, spec);
      if (target.kind !== 'file' || !target.path.startsWith('lib/')) continue;
      if (LEAF_UTILITIES.includes(target.path)) continue;
      found.add(`${file} -> ${target.path}`);
    }
  }
  return [...found].sort();
}

describe('db/ holds queries only', () => {
  it('reads the imports of db/ (a guard against a check that finds nothing)', () => {
    expect(importSpecifiers('db/routes.ts')).toContain('./client');
    expect(dbImportsOfLib().length).toBeGreaterThan(0);
  });

  it('no file under db/ imports from lib/ beyond leaf utilities, except the listed moves still to do', () => {
    expect(dbImportsOfLib().filter((x) => !NOT_YET_MOVED.includes(x))).toEqual([]);
  });

  it('every listed move is still to do (strike the entry once the import is gone)', () => {
    const now = dbImportsOfLib();
    expect(NOT_YET_MOVED.filter((x) => !now.includes(x))).toEqual([]);
  });

  it('saved routes and soundings run the engine in their services, not in db/', () => {
    const engine = dbImportsOfLib().filter((x) => /^db\/(routes|soundings)\.ts /.test(x));
    expect(engine).toEqual([]);
  });

  it('no import circle among db/ modules, type-only imports included (the workspace hook registry made one)', () => {
    const graph = new Map<string, string[]>();
    for (const file of sourceFilesUnder('db')) {
      const from = file.replace(/\.ts$/, '');
      graph.set(
        from,
        importSpecifiers(file).flatMap((spec) => {
          const target = resolveSpecifier(file, spec);
          return target.kind === 'file' && target.path.startsWith('db/') ? [target.path] : [];
        }),
      );
    }
    const cycles: string[] = [];
    const visit = (node: string, trail: string[]): void => {
      if (trail.includes(node)) {
        cycles.push([...trail.slice(trail.indexOf(node)), node].join(' -> '));
        return;
      }
      for (const next of graph.get(node) ?? []) visit(next, [...trail, node]);
    };
    for (const node of graph.keys()) visit(node, []);
    expect(cycles).toEqual([]);
  });
});
