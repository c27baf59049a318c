import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { BENCH_DIST_DIR, benchNextEnv } from '@/tests/bench/dist-dir';

// A `next build` replaces the build directory under any `next start` serving from it, so the
// benchmarks must build and serve from a directory of their own.
describe('benchmark build directory', () => {
  it('the Next config builds into TROPOPASS_DIST_DIR, and the benchmark environment sets it away from .next', async () => {
    const env = benchNextEnv({ NODE_ENV: 'production' });
    expect(env.TROPOPASS_DIST_DIR).toBe(BENCH_DIST_DIR);
    expect(BENCH_DIST_DIR).not.toBe('.next');
    const before = process.env.TROPOPASS_DIST_DIR;
    process.env.TROPOPASS_DIST_DIR = env.TROPOPASS_DIST_DIR;
    try {
      const config = (await import(pathToFileURL(path.resolve('next.config.mjs')).href)) as {
        default: { distDir?: string };
      };
      expect(config.default.distDir).toBe(BENCH_DIST_DIR);
    } finally {
      if (before === undefined) delete process.env.TROPOPASS_DIST_DIR;
      else process.env.TROPOPASS_DIST_DIR = before;
    }
  });

  it.each(['app-bench.ts', 'load.ts'])(
    'tests/bench/%s builds and starts the app with the benchmark environment',
    (file) => {
      const source = fs.readFileSync(path.join('tests/bench', file), 'utf8');
      expect(source).toMatch(/benchNextEnv\(/);
      // Every build call in the file goes through the benchmark environment (the call may span a few lines).
      const lines = source.split('\n');
      lines.forEach((l, i) => {
        if (!/'build'\]|\bbuild\(/.test(l) || /^\s*(\*|\/\/|export function)/.test(l)) return;
        expect(lines.slice(i, i + 4).join('\n')).toMatch(/benchNextEnv/);
      });
    },
  );

  it.each(['import.ts', 'track-app.ts'])('tests/bench/%s builds only through app-bench.ts (lockAndBuild)', (file) => {
    const source = fs.readFileSync(path.join('tests/bench', file), 'utf8');
    expect(source).toMatch(/lockAndBuild\(/);
    expect(source).toMatch(/from '\.\/app-bench'/);
    expect(source).not.toMatch(/'build'\]|\bbuild\(/);
  });
});
