import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';
import { walk } from './routes';

export * from './routes';

/** Server-action files, found by walking the tree so that a new one cannot be missed. */
const ROOT = process.cwd();

export interface ActionExport {
  file: string;
  name: string;
  /** The guard calls found in its body, e.g. `requireActionMember:members:manage`, `requireActionUser`, `assertSameOrigin`. */
  guards: string[];
  /** Guard calls whose permission argument is not a string literal (cannot be checked statically). */
  dynamicPermission: boolean;
}

function isUseServerFile(source: ts.SourceFile): boolean {
  const first = source.statements[0];
  return (
    !!first &&
    ts.isExpressionStatement(first) &&
    ts.isStringLiteral(first.expression) &&
    first.expression.text === 'use server'
  );
}

function guardsIn(node: ts.Node): { guards: string[]; dynamicPermission: boolean } {
  const guards: string[] = [];
  let dynamicPermission = false;
  const visit = (n: ts.Node) => {
    if (ts.isCallExpression(n) && ts.isIdentifier(n.expression)) {
      const fn = n.expression.text;
      if (fn === 'requireActionMember') {
        const perm = n.arguments[1];
        if (perm && ts.isStringLiteral(perm)) guards.push(`requireActionMember:${perm.text}`);
        else dynamicPermission = true;
      } else if (fn === 'requireActionUser' || fn === 'assertSameOrigin') {
        guards.push(fn);
      }
    }
    ts.forEachChild(n, visit);
  };
  visit(node);
  return { guards, dynamicPermission };
}

const exported = (n: ts.Node) =>
  ts.canHaveModifiers(n) && (ts.getModifiers(n) ?? []).some((m) => m.kind === ts.SyntaxKind.ExportKeyword);

/** Every exported function of every `'use server'` file under app/ and lib/, with the guards its body calls. */
export function serverActions(): { files: string[]; actions: ActionExport[] } {
  const files: string[] = [];
  const actions: ActionExport[] = [];
  for (const abs of [...walk(path.join(ROOT, 'app')), ...walk(path.join(ROOT, 'lib'))]) {
    if (!/\.(ts|tsx)$/.test(abs)) continue;
    const text = fs.readFileSync(abs, 'utf8');
    if (!text.includes('use server')) continue;
    const source = ts.createSourceFile(
      abs,
      text,
      ts.ScriptTarget.Latest,
      true,
      abs.endsWith('x') ? ts.ScriptKind.TSX : ts.ScriptKind.TS,
    );
    if (!isUseServerFile(source)) continue;
    const file = path.relative(ROOT, abs);
    files.push(file);
    for (const st of source.statements) {
      if (ts.isFunctionDeclaration(st) && exported(st) && st.name) {
        actions.push({ file, name: st.name.text, ...guardsIn(st) });
      } else if (ts.isVariableStatement(st) && exported(st)) {
        for (const d of st.declarationList.declarations) {
          if (ts.isIdentifier(d.name)) actions.push({ file, name: d.name.text, ...guardsIn(d) });
        }
      } else if (ts.isExportDeclaration(st) || ts.isExportAssignment(st)) {
        // Re-exports would hide the guard from this check; a 'use server' file must define its actions.
        actions.push({
          file,
          name: `(re-export at ${source.getLineAndCharacterOfPosition(st.getStart()).line + 1})`,
          guards: [],
          dynamicPermission: false,
        });
      }
    }
  }
  return { files, actions };
}
