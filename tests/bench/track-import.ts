/**
 * Track-file import benchmark (issue 13): a deterministic file of 2 000 invented flights of 500
 * points each (1 000 000 points, about 50 MB) written to a temp file, then read as a stream through
 * the import's own reader (papaparse, points kept per flight in typed arrays), checked as screening
 * inputs (the workspace's one aircraft type supplies the emission) and screened flight by flight
 * with the totals the import worker computes. Prints seconds per stage and the peak RSS of this
 * process (the screening runs on one thread here; the worker spreads it over its pool). The database write and the per-chunk ledger are not included (see the schedule import
 * benchmark for those, against the built app). Figures only.
 *
 * Run: npx tsx tests/bench/track-import.ts [flights] [pointsPerFlight]
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseTrackCsv, prepareTrackFlights } from '../../lib/imports/tracks';
import { screenTotals, type ScreeningInput } from '../../lib/screening/index';
import type { AircraftForScreening } from '../../db/aircraft-lookup';
import { writeTrackFile } from './track-file';

const FLIGHTS = Number(process.argv[2] ?? 2000);
const PER = Number(process.argv[3] ?? 500);
const file = path.join(os.tmpdir(), `tropopass-bench-tracks-${process.pid}.csv`);

const aircraft = new Map<string, AircraftForScreening>([
  [
    'BT-1',
    {
      id: 1,
      code: 'BT-1',
      engineCount: 2,
      typicalMach: 0.84,
      typicalFlightLevel: 370,
      defaultFleetId: null,
      emission: { eiNoxGPerKg: 14 },
    },
  ],
]);

const t0 = performance.now();
const bytes = await writeTrackFile(file, FLIGHTS, PER, 'BT-1');
const t1 = performance.now();
const parsed = await parseTrackCsv(fs.createReadStream(file));
const t2 = performance.now();
const rssAfterParse = process.memoryUsage().rss;
const prepared = prepareTrackFlights(parsed, { aircraft, planned: new Map(), flownKeys: new Set() });
const t3 = performance.now();
if (parsed.problems.length || prepared.problems.length)
  throw new Error(`problems: ${JSON.stringify([...parsed.problems, ...prepared.problems].slice(0, 3))}`);
let above = 0;
for (const f of prepared.flights) above += screenTotals(JSON.parse(f.inputJson) as ScreeningInput).noxAboveTropopauseKg;
const t4 = performance.now();
fs.rmSync(file, { force: true });
const s = (a: number, b: number) => ((b - a) / 1000).toFixed(1);
console.log(
  `track import: ${FLIGHTS} flights x ${PER} points = ${parsed.points.toLocaleString('en-GB')} points, ${(bytes / 1024 / 1024).toFixed(1)} MB; ` +
    `write ${s(t0, t1)} s (not counted); stream-read ${s(t1, t2)} s, check ${s(t2, t3)} s, screen ${s(t3, t4)} s on one thread, ` +
    `read-to-screened ${s(t1, t4)} s (target < 60 s with the database write); RSS after read ${(rssAfterParse / 1024 / 1024).toFixed(0)} MB, peak ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB; NOx above ${above.toFixed(0)} kg`,
);
