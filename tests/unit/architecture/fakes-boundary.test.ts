import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, importSpecifiers, resolveSpecifier, sourceFilesUnder } from '../../support/imports';

/**
 * The local fakes stand in for hosted services: they must run without the app, and the app must
 * never run with them. The one thing they share is the plan catalogue, which is plain data.
 */
const SHARED_WITH_FAKES = ['lib/billing/plan-catalogue'];
const fakeFiles = sourceFilesUnder('lib/fakes');
const appFiles = ['app', 'components', 'db', 'lib', 'migrations', 'seeds']
  .flatMap((dir) => sourceFilesUnder(dir))
  .concat(['proxy.ts', 'instrumentation.ts', 'knexfile.ts', 'next.config.mjs'])
  .filter((f) => !f.startsWith('lib/fakes/'));

describe('the local fakes are tools, not the app', () => {
  it('finds the fakes and reads imports (a guard against a test that checks nothing)', () => {
    expect(fakeFiles).toContain('lib/fakes/payment/catalogue.ts');
    expect(importSpecifiers('lib/fakes/payment/catalogue.ts')).toContain('../../billing/plan-catalogue');
  });

  it('no file under lib/fakes imports app code, only other fakes and the shared plan catalogue', () => {
    const offending: string[] = [];
    for (const file of fakeFiles) {
      for (const spec of importSpecifiers(file)) {
        const target = resolveSpecifier(file, spec);
        if (target.kind !== 'file') continue;
        if (target.path.startsWith('lib/fakes/') || SHARED_WITH_FAKES.includes(target.path)) continue;
        offending.push(`${file} imports ${spec}`);
      }
    }
    expect(offending).toEqual([]);
  });

  it('the shared plan catalogue imports nothing, so sharing it pulls no app code into the fakes', () => {
    for (const shared of SHARED_WITH_FAKES) expect(importSpecifiers(`${shared}.ts`)).toEqual([]);
  });

  it('no app file imports a fake', () => {
    const offending = appFiles.flatMap((file) =>
      importSpecifiers(file)
        .filter((spec) => {
          const target = resolveSpecifier(file, spec);
          return target.kind === 'file' && target.path.startsWith('lib/fakes/');
        })
        .map((spec) => `${file} imports ${spec}`),
    );
    expect(offending).toEqual([]);
  });

  it('packages only the fakes use are development dependencies, not the app’s', () => {
    const pkg = JSON.parse(fs.readFileSync(path.join(ROOT, 'package.json'), 'utf8')) as {
      dependencies: Record<string, string>;
      devDependencies: Record<string, string>;
    };
    const packagesOf = (files: string[]): Set<string> =>
      new Set(
        files.flatMap((file) =>
          importSpecifiers(file).flatMap((spec) => {
            const target = resolveSpecifier(file, spec);
            return target.kind === 'package' ? [target.name] : [];
          }),
        ),
      );
    const appPackages = packagesOf(appFiles);
    const fakeOnly = [...packagesOf(fakeFiles)].filter((name) => !appPackages.has(name));
    expect(fakeOnly).toEqual(expect.arrayContaining(['smtp-server', 'mailparser', 'concurrently']));
    for (const name of fakeOnly) {
      expect({ name, inDependencies: name in pkg.dependencies }).toEqual({ name, inDependencies: false });
      expect({ name, inDevDependencies: name in pkg.devDependencies }).toEqual({ name, inDevDependencies: true });
    }
  });
});

describe('public/', () => {
  it('robots.txt keeps signed-in pages, the API and token links out of crawlers', () => {
    const robots = fs.readFileSync(path.join(ROOT, 'public/robots.txt'), 'utf8');
    expect(robots).toMatch(/^User-agent: \*$/m);
    for (const p of ['/api/', '/w/', '/account', '/invite/', '/reset/']) expect(robots).toContain(`Disallow: ${p}\n`);
  });
});
