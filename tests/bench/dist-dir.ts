/**
 * Where the benchmarks build and serve the app from: their own `distDir`, never the checkout's
 * `.next`, so `npm run bench` cannot replace the chunks of a demo or test server running beside it.
 */
import fs from 'node:fs';
import path from 'node:path';

export const BENCH_DIST_DIR = '.next-bench';

/** The environment for `next build` and `next start` of a benchmark: the build goes to BENCH_DIST_DIR. */
export function benchNextEnv(env: NodeJS.ProcessEnv): NodeJS.ProcessEnv {
  return { ...env, TROPOPASS_DIST_DIR: BENCH_DIST_DIR };
}

export function hasBenchBuild(root: string): boolean {
  return fs.existsSync(path.join(root, BENCH_DIST_DIR, 'BUILD_ID'));
}
