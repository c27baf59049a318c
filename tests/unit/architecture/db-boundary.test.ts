import { describe, expect, expectTypeOf, it } from 'vitest';
import type { ImportStatus as StoredImportStatus } from '@/db/imports';
import { IMPORT_STATUSES, type ImportStatus } from '@/lib/validation/imports';
import { importSpecifiers, resolveSpecifier, sourceFilesUnder } from '../../support/imports';

/**
 * `db/` holds queries; rules (the billing gate, engine work, tokens) live in services under `lib/`
 * that own the write transaction. So `db/` may import only leaf utilities from `lib/`.
 */
/** Leaf utilities: errors, clock, units, and plain data or types with no imports (roles, the plan catalogue, problems). */
const LEAF_UTILITIES = [
  'lib/errors',
  'lib/clock',
  'lib/units',
  'lib/auth/roles',
  'lib/billing/plan-catalogue',
  // Types only, no imports: the { line, column, message } problem and the { path, message } one.
  'lib/validation/problems',
];

/** Every `file -> lib/...` import of db/, leaf utilities included unless `beyondLeaves`. */
function dbImportsOfLib(beyondLeaves = true): string[] {
  const found = new Set<string>();
  for (const file of sourceFilesUnder('db')) {
    for (const spec of importSpecifiers(file)) {
      const target = resolveSpecifier(file, spec);
      if (target.kind !== 'file' || !target.path.startsWith('lib/')) continue;
      if (beyondLeaves && LEAF_UTILITIES.includes(target.path)) continue;
      found.add(`${file} -> ${target.path}`);
    }
  }
  return [...found].sort();
}

describe('db/ holds queries only', () => {
  it('reads the imports of db/ (a guard against a check that finds nothing)', () => {
    expect(importSpecifiers('db/routes.ts')).toContain('./client');
    expect(dbImportsOfLib(false)).toContain('db/imports.ts -> lib/errors');
  });

  it('no file under db/ imports from lib/ beyond leaf utilities', () => {
    expect(dbImportsOfLib()).toEqual([]);
  });

  it('db/imports.ts declares the same import statuses as the validation module (checked by the typecheck)', () => {
    expectTypeOf<StoredImportStatus>().toEqualTypeOf<ImportStatus>();
    expect(IMPORT_STATUSES).toEqual(['queued', 'screening', 'complete', 'failed']);
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
