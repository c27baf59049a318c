import { describe, expect, it } from 'vitest';
import { newPage, screenshot, signIn, useBrowser } from './support/browser';
import { findAirport } from '../../lib/screening/airports';
import { planRoute, pointOnLeg } from '../../lib/screening/great-circle';

const { browser } = useBrowser();

/**
 * A flown track of the demo's planned flight SKP211 on 2026-11-17 (EGLL to KSEA, seeded with
 * DEMO_TODAY=2026-11-20): a point every 60 km on the great circle at 245 m/s, climbing to FL370 and
 * descending; no aircraft or fuel columns, so both come from the planned flight.
 */
function trackFile(opts: { badLine?: boolean } = {}): Buffer {
  const a = findAirport('EGLL')!;
  const b = findAirport('KSEA')!;
  const plan = planRoute(Float64Array.of(a.lat, b.lat), Float64Array.of(a.lon, b.lon));
  const n = Math.ceil(plan.totalKm / 60) + 1;
  const out = [0, 0];
  const t0 = Date.parse('2026-11-17T11:00:00Z');
  const rows = ['flight,date,time,lat,lon,altitude_ft,origin,destination'];
  for (let i = 0; i < n; i++) {
    const km = (plan.totalKm * i) / (n - 1);
    pointOnLeg(plan, 0, km, out);
    const level = 370 * Math.min(1, km / 250, (plan.totalKm - km) / 250);
    const time = new Date(t0 + (km / 0.245) * 1000).toISOString().slice(11, 19);
    const lat = opts.badLine && i === 3 ? '97.5' : out[0].toFixed(4);
    rows.push(`SKP211,2026-11-17,${time},${lat},${out[1].toFixed(4)},${Math.round(level * 100)},EGLL,KSEA`);
  }
  return Buffer.from(rows.join('\r\n') + '\r\n', 'utf8');
}

describe('flown tracks journey (analyst, skarn-polar)', () => {
  it('a track file is checked by line and column, accepted, screened, and its flight shows planned vs flown', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'analyst@tropopass.test');
    await page.goto('/w/skarn-polar/imports');
    await page.getByRole('heading', { name: 'Upload flown tracks' }).waitFor();
    await page.getByRole('link', { name: 'Download the track template (CSV)' }).waitFor();

    await page.setInputFiles('#track-file', {
      name: 'skp211-bad.csv',
      mimeType: 'text/csv',
      buffer: trackFile({ badLine: true }),
    });
    await page.getByRole('button', { name: 'Upload the tracks' }).click();
    await page.getByRole('alert').filter({ hasText: 'Nothing was imported' }).waitFor();
    const cells = await page
      .getByRole('table', { name: 'Problems in the track file' })
      .locator('tbody tr')
      .first()
      .locator('td')
      .allTextContents();
    expect(cells[0]).toBe('5');
    expect(cells[1]).toBe('lat');
    await screenshot(page, 'tracks-refused');

    await page.setInputFiles('#track-file', { name: 'skp211-flown.csv', mimeType: 'text/csv', buffer: trackFile() });
    await page.getByRole('button', { name: 'Upload the tracks' }).click();
    await page.getByRole('status').filter({ hasText: 'Accepted: 1 flown flight' }).waitFor();
    const item = page.locator('li[data-testid^="import-"]').filter({ hasText: 'skp211-flown.csv' });
    await item.waitFor();
    await item.getByTestId('import-status').filter({ hasText: 'Complete' }).waitFor({ timeout: 30_000 });
    await screenshot(page, 'tracks-accepted');

    await page.goto('/w/skarn-polar/flights?from=2026-11-17&to=2026-11-17');
    const table = page.getByRole('table', { name: 'Flights and their screening figures' });
    await table.waitFor();
    expect(await table.textContent()).toContain('flown track');
    await table.getByRole('link', { name: 'SKP211' }).first().click();
    await page.waitForURL(/\/w\/skarn-polar\/flights\/\d+$/);
    await page.getByRole('heading', { level: 1, name: 'SKP211 · EGLL → KSEA' }).waitFor();
    const pvf = page.getByTestId('planned-vs-flown');
    await pvf.waitFor();
    const text = (await pvf.textContent()) ?? '';
    expect(text).toContain('NOx above the tropopause');
    expect(text).toContain('Share of NOx above');
    await page
      .getByRole('img', { name: 'Vertical profile of the flown track with the planned cruise over it' })
      .waitFor();
    await screenshot(page, 'flight-planned-vs-flown');
    expect(errors.filter((e) => !/status of 422/.test(e))).toEqual([]);
    await context.close();
  });
});
