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

const FLIGHTS = Number(process.argv[2] ?? 2000);
const PER = Number(process.argv[3] ?? 500);
const file = path.join(os.tmpdir(), `tropopass-bench-tracks-${process.pid}.csv`);

async function writeFile(): Promise<number> {
  const out = fs.createWriteStream(file);
  out.write('flight,date,time,lat,lon,altitude_ft,fuel_flow_kg_h,aircraft,origin,destination\r\n');
  for (let f = 0; f < FLIGHTS; f++) {
    const lon0 = -150 + (f % 50) * 5;
    const day = String(1 + (f % 28)).padStart(2, '0');
    let chunk = '';
    for (let i = 0; i < PER; i++) {
      // 500 points every 20 s on a line of latitude 55-65N at about 230 m/s (0.08 degrees of longitude).
      const s = i * 20;
      const t = `${String(8 + Math.floor(s / 3600)).padStart(2, '0')}:${String(Math.floor(s / 60) % 60).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
      const alt = Math.round(37000 * Math.min(1, i / 60, (PER - 1 - i) / 60));
      chunk += `BT${f},2026-10-${day},${t},${(55 + (f % 10)).toFixed(4)},${(lon0 + i * 0.08).toFixed(4)},${alt},${6500 + (i % 7) * 10},BT-1,EFHK,PANC\r\n`;
    }
    if (!out.write(chunk)) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((r) => out.end(() => r()));
  return fs.statSync(file).size;
}

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
const bytes = await writeFile();
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
