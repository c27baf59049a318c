import { describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();

/** An engine version older than any the code carries; the row is written with it directly. */
const OLD = '2026.12.1';

const FLIGHT = {
  route: { waypoints: [{ airport: 'ENGM' }, { airport: 'PANC' }] },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 48_000,
  emission: { eiNoxGPerKg: 15 },
  month: 1,
  name: 'Stored-results journey',
};

describe('a screening made with an older engine version', () => {
  it('says so on its page and is screened again with the current method as a new, unbilled screening', async () => {
    const file = process.env.SQLITE_FILE;
    expect(file, 'the e2e runner sets SQLITE_FILE').toBeTruthy();
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'planner@tropopass.test');
    const saved = await page.request.post('/api/v1/workspaces/skarn-polar/screenings', { data: FLIGHT });
    expect(saved.status()).toBe(201);
    const { id } = (await saved.json()) as { id: number };
    const sqlite = new Database(file!);
    try {
      sqlite.prepare('UPDATE screenings SET engine_version = ? WHERE id = ?').run(OLD, id);
      const units = () =>
        (
          sqlite
            .prepare(
              'SELECT count(*) AS n FROM usage_events WHERE kind = ? AND source_id IN (SELECT id FROM screenings WHERE id = ? OR rescreen_of = ?)',
            )
            .get('screening', id, id) as { n: number }
        ).n;
      expect(units()).toBe(1);

      await page.goto('/w/skarn-polar/screenings');
      const listed = page.locator('tr').filter({ has: page.locator(`a[href="/w/skarn-polar/screenings/${id}"]`) });
      expect(await listed.getByTestId('older-engine-version').textContent()).toBe(`engine ${OLD} (older)`);

      await page.goto(`/w/skarn-polar/screenings/${id}`);
      const notice = page.getByTestId('engine-version-notice');
      await notice.waitFor();
      expect(await notice.textContent()).toContain(`older engine version (${OLD})`);
      await screenshot(page, 'screening-older-engine');
      await notice.getByRole('button', { name: 'Screen again with the current method' }).click();
      await page.waitForURL((u) => /\/screenings\/\d+$/.test(u.pathname) && !u.pathname.endsWith(`/${id}`));
      await page.getByText(`screening #${id}`).first().waitFor();
      expect(await page.getByTestId('engine-version-notice').count()).toBe(0);
      expect(await page.locator('main').textContent()).toContain('not billed again');
      await screenshot(page, 'screening-rescreened');
      expect(units()).toBe(1);

      // The old one now links to its re-screen instead of offering another.
      await page.goto(`/w/skarn-polar/screenings/${id}`);
      await page
        .getByTestId('engine-version-notice')
        .getByRole('link', { name: /screening #\d+/ })
        .waitFor();
      expect(await page.getByRole('button', { name: 'Screen again with the current method' }).count()).toBe(0);
    } finally {
      sqlite.close();
    }
    expect(errors).toEqual([]);
    await context.close();
  });
});
