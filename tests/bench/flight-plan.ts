/**
 * Flight-plan parsing benchmark (issue 13): a 200-item item-15 route (speed/level group, named
 * points from a 2 000-point fix library, coordinates, airways through a 200-airway library, DCT,
 * level changes) parsed repeatedly. Prints the time per parse (p50, p95, mean). Figures only.
 *
 * Run: npx tsx tests/bench/flight-plan.ts [runs]
 */
import { parseFlightPlanRoute, type FlightPlanAirway, type FlightPlanFix } from '../../lib/screening/index';

const RUNS = Number(process.argv[2] ?? 2000);

const fixes: FlightPlanFix[] = [];
for (let i = 0; i < 2000; i++) {
  const name = `B${String.fromCharCode(65 + (i % 26))}${String.fromCharCode(65 + (Math.floor(i / 26) % 26))}${String.fromCharCode(65 + Math.floor(i / 676))}`;
  fixes.push({ name, lat: 40 + (i % 40), lon: -60 + Math.floor(i / 40) });
}
const airways: FlightPlanAirway[] = [];
for (let a = 0; a < 200; a++)
  airways.push({ name: `UQ${a + 1}`, fixes: fixes.slice(a * 10, a * 10 + 10).map((f) => f.name) });

// 200 items: the speed/level group, then repeating [fix, airway, fix, DCT, coordinate/change].
const items = ['M084F350'];
let k = 0;
while (items.length < 200) {
  const a = k % 200;
  const seq = airways[a].fixes;
  items.push(seq[0], airways[a].name, seq[6], 'DCT');
  items.push(
    `${50 + (k % 30)}${k % 2 ? 30 : 15}N0${20 + (k % 40)}00W${k % 3 === 0 ? `/M084F${350 + (k % 4) * 20}` : ''}`,
    'DCT',
  );
  k++;
}
const text = items.slice(0, 200).join(' ');

const first = parseFlightPlanRoute(text, { from: 'EGLL', to: 'KJFK', fixes, airways });
const times: number[] = [];
for (let i = 0; i < RUNS; i++) {
  const t0 = performance.now();
  parseFlightPlanRoute(text, { from: 'EGLL', to: 'KJFK', fixes, airways });
  times.push(performance.now() - t0);
}
times.sort((a, b) => a - b);
const mean = times.reduce((s, t) => s + t, 0) / times.length;
console.log(
  `flight plan: ${items.slice(0, 200).length} items -> ${first.waypoints.length} waypoints, ${first.cruise.steps.length} steps, ${first.unresolved.length} unresolved; ` +
    `${RUNS} parses: p50 ${times[Math.floor(RUNS * 0.5)].toFixed(3)} ms, p95 ${times[Math.floor(RUNS * 0.95)].toFixed(3)} ms, mean ${mean.toFixed(3)} ms (target < 2 ms)`,
);
