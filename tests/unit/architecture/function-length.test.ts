import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';
import { ROOT, sourceFilesUnder } from '../../support/imports';

/**
 * Long units are hard to change: no function in the product code is longer than 150 lines, and no
 * React component longer than 250. Measured with the TypeScript compiler on every function-like node
 * (declarations, expressions, arrows, methods, accessors, constructors), from its first line to its
 * last, nested functions included. A component is a function whose name starts with a capital letter
 * (a declaration, or the variable an arrow or function expression is assigned to).
 */
const FUNCTION_MAX_LINES = 150;
const COMPONENT_MAX_LINES = 250;

/** Folders of product code; tests, migrations and seeds live outside them. */
const PRODUCT_DIRS = ['app', 'components', 'lib', 'db'];

/** Data tables (generated or transcribed values), not code to read as units. */
const DATA_TABLES = /(^|\/)[^/]*-(data|table|tables)\.(ts|mjs)$/;

/**
 * Units still over the limit, as `file:name`. The list may only shrink: an entry that is now within
 * the limit (or gone) fails too, so it is struck once the unit is split.
 */
const NOT_YET_SPLIT: string[] = [];

interface Unit {
  id: string;
  lines: number;
  limit: number;
}

function nameOf(node: ts.Node): string {
  if ((ts.isFunctionDeclaration(node) || ts.isMethodDeclaration(node)) && node.name) return node.name.getText();
  if (ts.isGetAccessor(node) || ts.isSetAccessor(node)) return node.name.getText();
  if (ts.isConstructorDeclaration(node)) return 'constructor';
  const parent = node.parent;
  if (parent && ts.isVariableDeclaration(parent)) return parent.name.getText();
  if (parent && ts.isPropertyAssignment(parent)) return parent.name.getText();
  if (parent && ts.isCallExpression(parent)) {
    const grand = parent.parent;
    if (grand && ts.isVariableDeclaration(grand)) return grand.name.getText();
  }
  if (parent && ts.isExportAssignment(parent)) return 'default';
  return '(anonymous)';
}

function unitsOf(file: string): Unit[] {
  const text = fs.readFileSync(path.join(ROOT, file), 'utf8');
  const source = ts.createSourceFile(
    file,
    text,
    ts.ScriptTarget.Latest,
    true,
    file.endsWith('x') ? ts.ScriptKind.TSX : ts.ScriptKind.TS,
  );
  const out: Unit[] = [];
  const visit = (node: ts.Node): void => {
    if (ts.isFunctionLike(node) && 'body' in node && node.body) {
      const start = source.getLineAndCharacterOfPosition(node.getStart(source)).line;
      const end = source.getLineAndCharacterOfPosition(node.getEnd()).line;
      const name = nameOf(node);
      const component = /^[A-Z]/.test(name) && file.endsWith('.tsx');
      const limit =
        component || (name === 'default' && file.endsWith('.tsx')) ? COMPONENT_MAX_LINES : FUNCTION_MAX_LINES;
      out.push({ id: `${file}:${name}`, lines: end - start + 1, limit });
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return out;
}

function productFiles(): string[] {
  return PRODUCT_DIRS.flatMap((dir) => sourceFilesUnder(dir)).filter((f) => !DATA_TABLES.test(f));
}

describe('no long units', () => {
  const units = productFiles().flatMap(unitsOf);

  it('finds the units it measures (a guard against a check that finds nothing)', () => {
    expect(units.length).toBeGreaterThan(500);
    expect(units.some((u) => u.limit === COMPONENT_MAX_LINES)).toBe(true);
    expect(units.find((u) => u.id === 'lib/units.ts:fuelToKg')?.lines).toBe(3);
  });

  it(`no function is longer than ${FUNCTION_MAX_LINES} lines and no component longer than ${COMPONENT_MAX_LINES}, except the listed ones still to split`, () => {
    const over = units.filter((u) => u.lines > u.limit && !NOT_YET_SPLIT.includes(u.id));
    expect(over.map((u) => `${u.id} (${u.lines} > ${u.limit})`)).toEqual([]);
  });

  it('every listed unit is still over its limit (strike the entry once it is split)', () => {
    const still = new Set(units.filter((u) => u.lines > u.limit).map((u) => u.id));
    expect(NOT_YET_SPLIT.filter((id) => !still.has(id))).toEqual([]);
  });
});
