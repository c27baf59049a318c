import { describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { newPage, screenshot, signIn, useBrowser, type TrackedPage } from './support/browser';

const { browser } = useBrowser();

/**
 * A page whose console errors are checked. Every error counts, a 404 from any part of the app
 * included; the 404 URLs the page met are listed in the failure message to say where to look.
 */
async function tracked(
  b: Browser,
  viewport?: { width: number; height: number },
): Promise<TrackedPage & { consoleErrors: () => string[] }> {
  const t = await newPage(b, viewport);
  const missing: string[] = [];
  t.page.on('response', (r) => {
    if (r.status() === 404) missing.push(r.url());
  });
  const consoleErrors = () => t.errors.map((e) => `${e} (404s: ${missing.join(', ') || 'none'})`);
  return { ...t, consoleErrors };
}

async function pickAirport(page: Page, label: string, code: string): Promise<void> {
  const box = page.getByRole('combobox', { name: label, exact: true });
  await box.fill(code);
  await page
    .getByRole('option', { name: new RegExp(`^${code}`) })
    .first()
    .waitFor();
  await box.press('ArrowDown');
  await box.press('Enter');
  await expect(box.inputValue()).resolves.toBe(code);
}

async function previewSettled(page: Page): Promise<void> {
  await page.getByTestId('preview-status').filter({ hasText: 'Up to date' }).waitFor({ timeout: 20_000 });
}

/** Saves a screening through the API from a signed-in page (the same call the form makes). */
async function saveThroughApi(page: Page, slug: string, body: Record<string, unknown>): Promise<number> {
  const res = await page.evaluate(
    async ({ slug, body }) => {
      const r = await fetch(`/api/v1/workspaces/${slug}/screenings`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify(body),
      });
      return { status: r.status, json: (await r.json()) as { id: number } };
    },
    { slug, body },
  );
  expect(res.status).toBe(201);
  return res.json.id;
}

describe('a flight planner screens a polar flight', () => {
  let savedId = 0;

  it('screens EGLL to PANC at FL350, sees the preview change at FL410, saves and reads the result', async () => {
    const { page, context, consoleErrors } = await tracked(browser());
    await signIn(page, 'planner@tropopass.test');
    await page.goto('/w/skarn-polar/screen');
    await page.getByRole('heading', { level: 1, name: 'Screen a flight' }).waitFor();
    await pickAirport(page, 'From', 'EGLL');
    await pickAirport(page, 'To', 'PANC');
    await page.getByLabel('Aircraft type', { exact: true }).selectOption('SK-LR1');
    await page.getByLabel('Flight level', { exact: true }).fill('350');
    await page.getByLabel('Cruise fuel burn (kg)').fill('52000');
    await previewSettled(page);
    const at350 = await page.getByTestId('nox-above').first().textContent();
    const ozone350 = await page.getByTestId('ozone-central').first().textContent();
    await page.getByTestId('what-if-table').first().waitFor();
    await screenshot(page, 'planner-screen-preview-fl350');

    await page.getByLabel('Flight level', { exact: true }).fill('410');
    await page
      .getByTestId('preview-status')
      .filter({ hasText: 'Updating' })
      .waitFor({ timeout: 5_000 })
      .catch(() => undefined);
    await previewSettled(page);
    await expect
      .poll(() => page.getByTestId('ozone-central').first().textContent(), { timeout: 15_000 })
      .not.toBe(ozone350);
    const at410 = await page.getByTestId('nox-above').first().textContent();
    expect(at410).not.toBe(at350);
    await screenshot(page, 'planner-screen-preview-fl410');

    await page.getByLabel('Name (optional)').fill('EGLL-PANC polar, FL410');
    await page.getByRole('button', { name: 'Save screening' }).dblclick();
    await page.waitForURL(/\/w\/skarn-polar\/screenings\/\d+$/, { timeout: 20_000 });
    savedId = Number(new URL(page.url()).pathname.split('/').pop());
    await page.getByRole('heading', { level: 1, name: 'EGLL-PANC polar, FL410' }).waitFor();
    await page.locator('canvas').first().waitFor();
    expect(await page.locator('canvas').count()).toBeGreaterThan(0);
    await page.getByTestId('route-map').waitFor();
    expect(await page.locator('[data-testid="route-map"] path[data-above]').count()).toBeGreaterThan(0);
    await page.getByTestId('what-if-table').waitFor();
    expect(await page.locator('[data-testid="what-if-table"] tr[data-lowest-impact="true"]').count()).toBe(1);
    await page.getByTestId('cautions').waitFor();
    await screenshot(page, 'planner-result');
    expect(consoleErrors()).toEqual([]);

    const count = await page.evaluate(async () => {
      const r = await fetch('/api/v1/workspaces/skarn-polar/screenings?route=PANC&limit=50');
      return ((await r.json()) as { items: { name: string }[] }).items.filter(
        (i) => i.name === 'EGLL-PANC polar, FL410',
      ).length;
    });
    expect(count).toBe(1);
    await context.close();
  });

  it('the what-if limit and segment table state live in the URL', async () => {
    const { page, context, consoleErrors } = await tracked(browser());
    await signIn(page, 'planner@tropopass.test');
    await page.goto(`/w/skarn-polar/screenings/${savedId}`);
    await page.getByLabel('Fuel-penalty limit (%)').fill('0');
    await page.getByRole('button', { name: 'Compare levels' }).click();
    await page.waitForURL(/limit=0/);
    const best = page.locator('[data-testid="what-if-table"] tr[data-lowest-impact="true"] th');
    await expect.poll(() => best.textContent()).toMatch(/^FL410/);
    await page.getByRole('button', { name: /^NOx \(as NO2\)/ }).click();
    await page.waitForURL(/seg_sort=noxKg\.desc/);
    await page.getByRole('button', { name: 'Next' }).click();
    await page.waitForURL(/seg_page=2/);
    await page.reload();
    await expect(page.getByText('Page 2 of').textContent()).resolves.toContain('Page 2');
    expect(consoleErrors()).toEqual([]);
    await context.close();
  });

  it('the history lists the screening, filters in the URL, and two picked compare side by side', async () => {
    const { page, context, consoleErrors } = await tracked(browser());
    await signIn(page, 'planner@tropopass.test');
    await page.goto('/w/skarn-polar/screenings');
    const otherId = await saveThroughApi(page, 'skarn-polar', {
      name: 'EGLL-RJAA comparison, FL370',
      route: { waypoints: [{ airport: 'EGLL' }, { airport: 'RJAA' }] },
      cruise: { flightLevel: 370 },
      fuelBurnKg: 58000,
      aircraft: 'SK-LR2',
      flightDate: '2026-11-20',
    });
    await page.goto('/w/skarn-polar/screenings?route=EGLL');
    await page.getByRole('link', { name: 'EGLL-PANC polar, FL410' }).waitFor();
    await page.getByRole('link', { name: 'EGLL-RJAA comparison, FL370' }).waitFor();
    await page.getByLabel('Route contains').fill('RJAA');
    await page.getByRole('button', { name: 'Filter' }).click();
    await page.waitForURL(/route=RJAA/);
    await page.getByRole('link', { name: 'EGLL-RJAA comparison, FL370' }).waitFor();
    expect(await page.getByRole('link', { name: 'EGLL-PANC polar, FL410' }).count()).toBe(0);
    await page.getByLabel('Min. share above (%)').fill('150');
    await page.getByRole('button', { name: 'Filter' }).click();
    await page.locator('#minAbove-error').filter({ hasText: 'between 0 and 100' }).waitFor();
    await page.goto('/w/skarn-polar/screenings');
    await page.getByRole('button', { name: /^Share above/ }).click();
    await page.waitForURL(/sort=fractionAboveTropopause/);
    await page.getByLabel('Pick EGLL-PANC polar, FL410 to compare').check();
    await page.getByLabel('Pick EGLL-RJAA comparison, FL370 to compare').check();
    await screenshot(page, 'planner-screenings');
    await page.getByRole('link', { name: 'Compare the two picked' }).click();
    await page.waitForURL(/\/screenings\/compare\?a=\d+&b=\d+/);
    expect(new URL(page.url()).searchParams.get('b')).toBe(String(otherId));
    await page.getByTestId('compare-table').waitFor();
    await page.locator('canvas').nth(1).waitFor();
    expect(await page.locator('canvas').count()).toBe(2);
    await screenshot(page, 'planner-compare');
    expect(consoleErrors()).toEqual([]);
    await context.close();
  });

  it('in aviation units at tablet width the result and the form speak NM, ft and lb', async () => {
    const { page, context, consoleErrors } = await tracked(browser(), { width: 820, height: 1180 });
    await signIn(page, 'planner@tropopass.test');
    const setUnits = async (label: string) => {
      await page.goto('/account');
      await page.getByLabel(label).check();
      await page.getByRole('status').filter({ hasText: 'Saved.' }).waitFor();
    };
    await setUnits('Aviation: nautical miles, feet, pounds');
    try {
      await page.goto(`/w/skarn-polar/screenings/${savedId}`);
      const figures = (await page.getByTestId('headline-figures').textContent()) ?? '';
      expect(figures).toMatch(/\d NM/);
      expect(figures).toMatch(/\d lb/);
      expect(figures).not.toMatch(/\d (km|kg)\b/);
      expect(await page.getByTestId('segment-table').textContent()).toMatch(/\d ft/);
      await page.locator('canvas').first().waitFor();
      await screenshot(page, 'planner-result-tablet-aviation');
      await page.goto('/w/skarn-polar/screen');
      await page.getByLabel('Cruise fuel burn (lb)').waitFor();
      await page.getByText('Step climbs', { exact: true }).click();
      await page.getByLabel('Step 1 starts at (NM)').waitFor();
      await screenshot(page, 'planner-screen-tablet-aviation');
      expect(consoleErrors()).toEqual([]);
    } finally {
      await setUnits('Metric: km, m, kg');
    }
    await context.close();
  });

  it('bad input is named beside the field and nothing is saved', async () => {
    const { page, context, consoleErrors } = await tracked(browser());
    await signIn(page, 'planner@tropopass.test');
    await page.goto('/w/skarn-polar/screen');
    await page.getByRole('combobox', { name: 'From', exact: true }).fill('EGLL');
    await page.getByRole('combobox', { name: 'To', exact: true }).fill('ZZZZ');
    await page.getByLabel('Cruise fuel burn (kg)').fill('52000');
    await page
      .locator('#airports-1-error')
      .filter({ hasText: /ZZZZ|airport/i })
      .waitFor({ timeout: 20_000 });
    await page.getByLabel('Flight level', { exact: true }).fill('900');
    await page.getByRole('button', { name: 'Save screening' }).click();
    await page.locator('#flightLevel-error').filter({ hasText: 'between 0 and 660' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/w/skarn-polar/screen');
    await screenshot(page, 'planner-screen-errors');
    expect(consoleErrors().filter((e) => !/status of 422/.test(e))).toEqual([]);
    await context.close();
  });
});

describe('a read-only member reads a screening', () => {
  it('sees the result, no Save and no way into the form', async () => {
    const owner = await newPage(browser());
    await signIn(owner.page, 'consultant@tropopass.test');
    await owner.page.goto('/w/velloway-jets');
    const id = await saveThroughApi(owner.page, 'velloway-jets', {
      name: 'Velloway check EGLL-KTEB',
      route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KTEB' }] },
      cruise: {
        steps: [
          { fromKm: 0, flightLevel: 430 },
          { fromKm: 2500, flightLevel: 470 },
        ],
      },
      fuelBurnKg: 9000,
      aircraft: 'VJ-50',
      flightDate: '2026-11-18',
    });
    await owner.context.close();

    const { page, context, consoleErrors } = await tracked(browser());
    await signIn(page, 'viewer@tropopass.test');
    const res = await page.goto(`/w/velloway-jets/screenings/${id}`);
    expect(res?.status()).toBe(200);
    await page.getByRole('heading', { level: 1, name: 'Velloway check EGLL-KTEB' }).waitFor();
    await page.locator('canvas').first().waitFor();
    await page.getByTestId('route-map').waitFor();
    await page.getByTestId('what-if-table').waitFor();
    expect(await page.getByRole('button', { name: /Save/ }).count()).toBe(0);
    expect(await page.getByRole('link', { name: /Screen (a|another) flight/ }).count()).toBe(0);
    await screenshot(page, 'viewer-result');
    const list = await page.goto('/w/velloway-jets/screenings');
    expect(list?.status()).toBe(200);
    await page.getByRole('link', { name: 'Velloway check EGLL-KTEB' }).waitFor();
    expect(await page.getByRole('link', { name: /Screen (a|another) flight/ }).count()).toBe(0);
    await screenshot(page, 'viewer-screenings');
    expect(consoleErrors()).toEqual([]);
    const form = await page.goto('/w/velloway-jets/screen');
    expect(form?.status()).toBe(403);
    expect((await page.goto('/w/velloway-jets/screenings/999999'))?.status()).toBe(404);
    expect((await page.goto(`/w/velloway-jets/screenings/compare?a=${id}&b=${id}`))?.status()).toBe(200);
    expect((await page.goto('/w/skarn-polar/screenings'))?.status()).toBe(404);
    const exported = await page.evaluate(async (id) => {
      const r = await fetch(`/api/v1/workspaces/velloway-jets/screenings/${id}/export?format=csv`);
      return { status: r.status, disposition: r.headers.get('content-disposition') };
    }, id);
    expect(exported.status).toBe(200);
    expect(exported.disposition).toMatch(/^attachment; filename="screening-/);
    const preview = await page.evaluate(async () => {
      const r = await fetch('/api/v1/workspaces/velloway-jets/screenings/preview', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: '{}',
      });
      return r.status;
    });
    expect(preview).toBe(403);
    await context.close();
  });
});
