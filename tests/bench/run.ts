/**
 * `npm run bench`: every benchmark in turn, each in its own process so one's memory does not colour
 * the next. Figures only; nothing here passes or fails on speed.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const benches = [
  'engine.ts',
  'flight-plan.ts',
  'track.ts',
  'track-import.ts',
  'uncertainty.ts',
  'fleet-uncertainty.ts',
  'import.ts',
  'track-app.ts',
]
  .map((f) => path.join('tests/bench', f))
  .filter((f) => fs.existsSync(f));
let failed = false;
for (const file of benches) {
  console.log(`\n=== ${file} ===`);
  // The fleet bench reads through db/ (server-only modules): run it with the server's resolve condition.
  const conditions = file.endsWith('fleet-uncertainty.ts') ? ['--conditions=react-server'] : [];
  const r = spawnSync(process.execPath, [...conditions, '--import', 'tsx', file, ...process.argv.slice(2)], {
    stdio: 'inherit',
  });
  if (r.status !== 0) failed = true;
}
process.exit(failed ? 1 : 0);
