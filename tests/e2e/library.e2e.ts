import { describe, expect, it } from 'vitest';
import { finishSignUp, newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();

const stamp = Date.now().toString(36).slice(-5).toUpperCase();

/**
 * 6.5 K/km from 15 °C at 0 m up to 11 km, isothermal above to 16 km: by the WMO (1957) definition
 * its tropopause is at 11 000 m.
 */
const SOUNDING_CSV = [
  'Altitude_m,Temperature_C',
  ...Array.from({ length: 17 }, (_, k) => `${k * 1000},${(k <= 11 ? 15 - 6.5 * k : -56.5).toFixed(2)}`),
].join('\n');

describe('the planner keeps the library', () => {
  it('adds an engine (a fuel-flow order error shown beside the field, then fixed), an aircraft type, a sounding with its chart, and a route', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'planner@tropopass.test');

    await page.goto('/w/skarn-polar/engines');
    await page.getByRole('heading', { level: 1, name: 'Engines & aircraft' }).waitFor();
    await page.getByText('demo data').filter({ visible: true }).first().waitFor();
    await screenshot(page, 'library-engines');

    const engineName = `Journey turbofan ${stamp}`;
    await page.getByLabel('Engine name').fill(engineName);
    const values: [string, string, string][] = [
      ['Idle', '0.1', '4.5'],
      ['Approach', '0.9', '10.2'],
      ['Climb-out', '0.3', '22.8'],
      ['Take-off', '1.1', '30.5'],
    ];
    for (const [mode, ff, ei] of values) {
      await page.getByLabel(`${mode} fuel flow (kg/s)`).fill(ff);
      await page.getByLabel(`${mode} EI NOx (g/kg)`).fill(ei);
    }
    await page.getByRole('button', { name: 'Add engine' }).click();
    const climbError = page.locator('#new-engine-ff-2-error');
    await climbError.waitFor();
    expect(await climbError.textContent()).toContain('climb-out fuel flow must be higher than the approach');
    await screenshot(page, 'library-engine-error');

    await page.getByLabel('Approach fuel flow (kg/s)').fill('0.3');
    await page.getByLabel('Climb-out fuel flow (kg/s)').fill('0.9');
    await page
      .locator('div[aria-live="polite"]', { hasText: 'Cruise check' })
      .getByText('typical', { exact: true })
      .waitFor();
    await page.getByRole('button', { name: 'Add engine' }).click();
    await page
      .getByRole('status')
      .filter({ hasText: `Added “${engineName}”` })
      .waitFor();
    await page.getByRole('link', { name: engineName }).waitFor();

    const code = `JT-${stamp}`;
    await page.getByLabel('Type code').fill(code);
    await page.getByLabel('Name', { exact: true }).fill('Journey twin');
    await page.getByLabel('Engine', { exact: true }).selectOption({ label: engineName });
    await page.getByLabel('Typical cruise Mach').fill('0.82');
    await page.getByLabel('Typical cruise flight level').fill('370');
    await page.getByRole('button', { name: 'Add aircraft type' }).click();
    await page
      .getByRole('status')
      .filter({ hasText: `Added aircraft type ${code}` })
      .waitFor();
    await page.getByRole('link', { name: code }).waitFor();
    await screenshot(page, 'library-engines-added');

    await page.goto('/w/skarn-polar/soundings');
    await page.getByRole('heading', { level: 1, name: 'Soundings' }).waitFor();
    await page.getByLabel('Name').fill(`Constructed ${stamp}`);
    await page.getByLabel('Station').fill('Journey test');
    await page.getByLabel('Observation time (UTC)').fill('2026-11-20T12:00');
    await page.setInputFiles('#sounding-file', {
      name: 'sounding.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(SOUNDING_CSV),
    });
    await page.getByRole('button', { name: 'Upload sounding' }).click();
    await page.waitForURL(/\/w\/skarn-polar\/soundings\/\d+$/);
    await page.locator('canvas').first().waitFor();
    const tropopause = page.getByText('WMO tropopause', { exact: true }).locator('..');
    expect(await tropopause.textContent()).toContain('11,000 m');
    await page.getByRole('link', { name: 'Use in a screening' }).waitFor();
    await screenshot(page, 'library-sounding');
    await page.getByRole('button', { name: 'Against pressure' }).click();
    await screenshot(page, 'library-sounding-pressure');

    await page.goto('/w/skarn-polar/routes');
    await page.getByLabel('Route name').fill(`Polar ${stamp}`);
    await page.getByLabel('Waypoints, in order').fill('EGLL\n80, -60\nKSEA');
    await page.getByRole('button', { name: 'Save route' }).click();
    await page.waitForURL(/\/w\/skarn-polar\/routes\/\d+$/);
    await page.getByRole('link', { name: 'Screen this route' }).waitFor();
    await screenshot(page, 'library-route');
    await page.goto('/w/skarn-polar/routes');
    await page.getByRole('link', { name: `Polar ${stamp}` }).waitFor();
    await screenshot(page, 'library-routes');

    await page.goto('/w/skarn-polar/engines');
    await page.getByRole('link', { name: code }).click();
    await page.waitForURL(/\/engines\/aircraft\/\d+$/);
    await page.getByRole('heading', { level: 1, name: code }).waitFor();
    await screenshot(page, 'library-aircraft-type');
    await page.getByRole('link', { name: engineName }).first().click();
    await page.waitForURL(/\/engines\/\d+$/);
    await page.getByRole('button', { name: 'Delete engine' }).waitFor();
    page.once('dialog', (d) => void d.accept());
    await page.getByRole('button', { name: 'Delete engine' }).click();
    await page.getByRole('alert').filter({ hasText: code }).waitFor();
    await screenshot(page, 'library-engine-in-use');

    expect(errors).toEqual([]);
    await context.close();
  });

  it('a bad sounding file lists its problems by line; an unknown airport is named beside the waypoints', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'planner@tropopass.test');
    await page.goto('/w/skarn-polar/soundings');
    await page.getByLabel('Name').fill('Broken');
    await page.setInputFiles('#sounding-file', {
      name: 'bad.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from('altitude_m,temperature_k\n0,288\n1000,hot\n2000,20\n'),
    });
    await page.getByRole('button', { name: 'Upload sounding' }).click();
    const table = page.getByRole('table', { name: 'Problems in the sounding file' });
    await table.waitFor();
    expect(await table.locator('tbody tr').count()).toBe(2);
    expect(await table.locator('tbody tr').first().textContent()).toContain('3');
    await screenshot(page, 'library-sounding-problems');

    await page.goto('/w/skarn-polar/engines');
    const header =
      'name,idle_ff_kg_s,approach_ff_kg_s,climb_out_ff_kg_s,take_off_ff_kg_s,idle_ei,approach_ei,climb_out_ei,take_off_ei,source';
    await page.setInputFiles('#engines-csv', {
      name: 'engines.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(
        `${header}\nGood ${stamp},0.1,0.3,0.9,1.1,4,10,22,30,\nBackwards ${stamp},0.1,0.9,0.3,1.1,4,10,22,30,\n`,
      ),
    });
    await page.getByRole('button', { name: 'Import engines' }).click();
    const engineProblems = page.getByRole('table', { name: 'Problems in the engines file' });
    await engineProblems.waitFor();
    expect(await engineProblems.locator('tbody tr').first().textContent()).toMatch(/^3climb_out_ff_kg_s/);
    expect(await page.getByRole('link', { name: `Good ${stamp}` }).count()).toBe(0);
    await screenshot(page, 'library-engine-import-problems');

    await page.goto('/w/skarn-polar/routes');
    await page.getByLabel('Route name').fill('Nowhere');
    await page.getByLabel('Waypoints, in order').fill('EGLL\nZZZZ');
    await page.getByRole('button', { name: 'Save route' }).click();
    const waypointError = page.locator('#new-route-waypoints-error');
    await waypointError.waitFor();
    expect(await waypointError.textContent()).toContain('Waypoint 2');
    await screenshot(page, 'library-route-error');
    expect(errors.filter((e) => !/status of 422/.test(e))).toEqual([]);
    await context.close();
  });

  it('in aviation units a new owner sees feet on the sounding, nautical miles on routes and lb/h on engines', async () => {
    const { page, context, errors } = await newPage(browser());
    const slug = `units-${stamp.toLowerCase()}`;
    await page.goto('/signup');
    await page.getByLabel('Your name').fill('Units Tester');
    await page.getByLabel('Work e-mail').fill(`units-${stamp.toLowerCase()}@example.test`);
    await page.getByLabel('Password').fill('long-enough-password');
    await page.getByLabel('First workspace (optional)').fill(slug);
    await page.getByRole('button', { name: 'Create account' }).click();
    await finishSignUp(page, `units-${stamp.toLowerCase()}@example.test`);
    expect(new URL(page.url()).pathname).toBe(`/w/${slug}`);
    await page.goto('/account');
    await page.getByLabel('Aviation: nautical miles, feet, pounds').check();
    await page.getByRole('status').filter({ hasText: 'Saved' }).waitFor();

    await page.goto(`/w/${slug}/soundings`);
    await page.getByText('No soundings yet').waitFor();
    await page.getByLabel('Name').fill('Feet check');
    await page.setInputFiles('#sounding-file', {
      name: 's.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(SOUNDING_CSV),
    });
    await page.getByRole('button', { name: 'Upload sounding' }).click();
    await page.waitForURL(/\/soundings\/\d+$/);
    // 11 000 m / 0.3048 m per ft = 36 089 ft (the international foot, exactly 0.3048 m).
    expect(await page.getByText('WMO tropopause', { exact: true }).locator('..').textContent()).toContain('36,089 ft');
    await page.locator('canvas').first().waitFor();
    await screenshot(page, 'library-sounding-imperial');

    await page.goto(`/w/${slug}/routes`);
    await page.getByText('No saved routes yet').waitFor();
    await page.getByLabel('Route name').fill('Quarter meridian');
    await page.getByLabel('Waypoints, in order').fill('0, 0\n90, 0');
    await page.getByRole('button', { name: 'Save route' }).click();
    await page.waitForURL(/\/routes\/\d+$/);
    // pi/2 x 6371.0088 km (IUGG mean radius) = 10 007.6 km = 5 403.7 NM at 1.852 km per NM.
    await page.getByText('5,404 NM').first().waitFor();

    await page.goto(`/w/${slug}/engines`);
    await page.getByText('No engines yet').waitFor();
    await page.getByLabel('Engine name').fill('Pounds check');
    for (const [mode, ff, ei] of [
      ['Idle', '0.1', '4.5'],
      ['Approach', '0.3', '10.2'],
      ['Climb-out', '0.9', '22.8'],
      ['Take-off', '1.1', '30.5'],
    ] as const) {
      await page.getByLabel(`${mode} fuel flow (kg/s)`).fill(ff);
      await page.getByLabel(`${mode} EI NOx (g/kg)`).fill(ei);
    }
    await page.getByRole('button', { name: 'Add engine' }).click();
    await page.getByRole('link', { name: 'Pounds check' }).waitFor();
    // 1.1 kg/s x 3600 s/h / 0.45359237 kg/lb = 8 730 lb/h.
    expect(await page.locator('tr', { hasText: 'Pounds check' }).textContent()).toContain('8,730');
    await page.getByText('Fuel flow per engine, lb/h').waitFor();
    await screenshot(page, 'library-engines-imperial');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a viewer reads engines, routes and soundings but sees no edit controls', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'viewer@tropopass.test');
    for (const [path, heading] of [
      ['/w/velloway-jets/engines', 'Engines & aircraft'],
      ['/w/velloway-jets/routes', 'Saved routes'],
      ['/w/velloway-jets/soundings', 'Soundings'],
    ] as const) {
      await page.goto(path);
      await page.getByRole('heading', { level: 1, name: heading }).waitFor();
      expect(
        await page
          .getByRole('button', { name: /Add engine|Add aircraft type|Import engines|Save route|Upload sounding/ })
          .count(),
      ).toBe(0);
    }
    await page.goto('/w/velloway-jets/engines');
    await page.getByText('VJ-50').first().waitFor();
    await screenshot(page, 'library-engines-viewer');
    await page.setViewportSize({ width: 820, height: 1100 });
    await screenshot(page, 'library-engines-viewer-tablet');
    expect(errors).toEqual([]);
    await context.close();
  });
});
