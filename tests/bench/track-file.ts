/**
 * The deterministic flown-track file of the track benchmarks (issue 13): `flights` invented flights
 * of `per` points each, written as a stream to `file` (never built whole in memory). Each flight flies
 * a line of latitude 55-64N eastwards, a point every 20 s at about 230 m/s, climbing to FL370 and
 * descending at the end. `aircraft` is the type code every row names (it must exist in the workspace
 * that imports the file). Returns the file's size in bytes.
 */
import fs from 'node:fs';

export async function writeTrackFile(file: string, flights: number, per: number, aircraft: string): Promise<number> {
  const out = fs.createWriteStream(file);
  out.write('flight,date,time,lat,lon,altitude_ft,fuel_flow_kg_h,aircraft,origin,destination\r\n');
  for (let f = 0; f < flights; f++) {
    const lon0 = -150 + (f % 50) * 5;
    const day = String(1 + (f % 28)).padStart(2, '0');
    let chunk = '';
    for (let i = 0; i < per; i++) {
      const s = i * 20;
      const t = `${String(8 + Math.floor(s / 3600)).padStart(2, '0')}:${String(Math.floor(s / 60) % 60).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
      const alt = Math.round(37000 * Math.min(1, i / 60, (per - 1 - i) / 60));
      chunk += `BT${f},2026-10-${day},${t},${(55 + (f % 10)).toFixed(4)},${(lon0 + i * 0.08).toFixed(4)},${alt},${6500 + (i % 7) * 10},${aircraft},EFHK,PANC\r\n`;
    }
    if (!out.write(chunk)) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((r) => out.end(() => r()));
  return fs.statSync(file).size;
}
