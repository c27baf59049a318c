import { describe, expect, it } from 'vitest';
import { newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();

describe('a planner reads how sure a screening is and how it changes over the year', () => {
  it('the result page shows the 5-95 % band, the drivers chart and the month strip with the planned month marked', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'planner@tropopass.test');
    await page.goto('/w/skarn-polar/screen');
    const saved = await page.evaluate(async () => {
      const r = await fetch('/api/v1/workspaces/skarn-polar/screenings', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({
          name: 'Spread check',
          route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
          cruise: { flightLevel: 370 },
          fuelBurnKg: 50_000,
          emission: { eiNoxGPerKg: 14 },
          month: 3,
          uncertainty: { samples: 400, seed: 12 },
        }),
      });
      return { status: r.status, body: (await r.json()) as { id: number } };
    });
    expect(saved.status).toBe(201);
    await page.goto(`/w/skarn-polar/screenings/${saved.body.id}`);
    const band = page.getByTestId('band-5-95').first();
    await band.waitFor();
    await expect(band.textContent()).resolves.toMatch(/^5–95 %: [\d.,]+ – [\d.,]+ (kg|t)$/);
    await expect(
      page
        .getByText(/screening range/)
        .first()
        .isVisible(),
    ).resolves.toBe(true);
    const drivers = page.getByTestId('drivers-chart');
    await drivers.waitFor();
    await expect(
      drivers.getByText(/explains \d+ % of the spread of NOx above the tropopause/).isVisible(),
    ).resolves.toBe(true);
    await expect(drivers.getByRole('listitem').count()).resolves.toBeGreaterThan(1);
    const strip = page.getByTestId('month-strip');
    await strip.waitFor();
    const months = strip.getByRole('listitem');
    await expect(months.count()).resolves.toBe(12);
    const planned = strip.locator('[aria-current="date"]');
    await expect(planned.count()).resolves.toBe(1);
    await expect(planned.textContent()).resolves.toMatch(/March: .*\(planned month\)/);
    await screenshot(page, 'uncertainty-result');
    expect(errors).toEqual([]);
    await context.close();
  });
});
