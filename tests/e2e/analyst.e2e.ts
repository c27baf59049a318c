import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { BASE_URL, mailTo, newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();
const SLUG = 'skarn-polar';
const OUTPUT = path.resolve(process.cwd(), 'tests/e2e/output');

interface Compare {
  totals: { flights: number };
  rows: { fleetName: string; aircraftCode: string | null }[];
}

/** A small schedule for when the demo flights are not seeded: polar routes over the demo months. */
function smallSchedule(): string {
  const rows = ['date,flight,origin,destination,aircraft,cruise_fl,fuel_kg,steps,fleet'];
  const routes: [string, string, string, number, number][] = [
    ['EFHK', 'RJTT', 'SK-LR1', 370, 62000],
    ['ENGM', 'KSEA', 'SK-LR2', 390, 58000],
    ['EKCH', 'PANC', 'SK-LR1', 350, 41000],
    ['BIKF', 'RJAA', 'SK-LR2', 380, 71000],
  ];
  const months = ['2026-09', '2026-10', '2026-11'];
  months.forEach((m, mi) =>
    routes.forEach(([o, d, ac, fl, fuel], ri) => {
      rows.push(
        `${m}-${String(3 + ri * 4).padStart(2, '0')},E2E${mi}${ri},${o},${d},${ac},${fl},${fuel + mi * 500},${ri === 0 ? `${fl}@0 ${fl + 20}@3000` : ''},`,
      );
    }),
  );
  return `${rows.join('\n')}\n`;
}

async function ensureScreenedFlights(page: Page): Promise<void> {
  const api = `${BASE_URL}/api/v1/workspaces/${SLUG}`;
  const first = (await (
    await page.request.get(`${api}/fleets/compare?from=2026-09-01&to=2026-11-20`)
  ).json()) as Compare;
  if (first.totals.flights > 0) return;
  const upload = await page.request.post(`${api}/imports`, {
    headers: { origin: BASE_URL },
    multipart: { file: { name: 'analyst-e2e.csv', mimeType: 'text/csv', buffer: Buffer.from(smallSchedule()) } },
  });
  expect(upload.status(), await upload.text()).toBe(202);
  const { id } = (await upload.json()) as { id: number };
  const until = Date.now() + 60_000;
  for (;;) {
    const s = (await (await page.request.get(`${api}/imports/${id}`)).json()) as { status: string };
    if (s.status === 'complete') break;
    if (s.status === 'failed' || Date.now() > until) throw new Error(`the import did not complete: ${s.status}`);
    await page.waitForTimeout(500);
  }
}

describe('sustainability analyst: compare fleets, build, download and send a report', () => {
  it('runs the whole journey', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'analyst@tropopass.test');
    await ensureScreenedFlights(page);

    await page.goto(`/w/${SLUG}/fleets`);
    await page.getByRole('heading', { level: 1, name: 'Fleets' }).waitFor();
    const table = page.locator('table').first();
    await table.getByRole('cell', { name: 'Polar long-haul A' }).waitFor();
    await expect(table.locator('tfoot').textContent()).resolves.toContain('All fleets');
    await page.getByRole('heading', { name: 'NOx above the tropopause by month', exact: true }).waitFor();
    // The sampled 5-95 % band of each fleet's totals and of all together.
    const band = page.getByTestId('fleet-percentiles');
    await band.getByRole('cell', { name: 'All fleets' }).waitFor();
    await expect(band.textContent()).resolves.toContain('Polar long-haul A');
    await screenshot(page, 'analyst-fleets-comparison');
    expect(errors).toEqual([]);

    // A filter: one aircraft type. The URL carries it, and the table follows.
    await page.getByLabel('Aircraft type').selectOption('SK-LR1');
    await page.getByRole('button', { name: 'Apply filters' }).click();
    await page.waitForURL(/aircraft=SK-LR1/);
    await expect
      .poll(async () => (await table.locator('tbody tr').allTextContents()).join('|'), { timeout: 15_000 })
      .not.toContain('Polar long-haul B');
    // Sorting and grouping live in the URL too, and survive a reload.
    await page.getByRole('radio', { name: 'Fleet and month' }).click();
    await page.waitForURL(/groupBy=month/);
    await table.getByRole('button', { name: /NOx above tropopause/ }).click();
    await page.waitForURL(/sort=noxAboveKg/);
    await page.reload();
    await page.getByRole('columnheader', { name: /Month/ }).waitFor();
    await expect(page.getByLabel('Aircraft type').inputValue()).resolves.toBe('SK-LR1');
    await screenshot(page, 'analyst-fleets-by-month');

    // Build a report for the demo months and both polar fleets.
    await page.goto(`/w/${SLUG}/reports`);
    await page.getByLabel('Period from').fill('2026-09-01');
    await page.getByLabel('Period to').fill('2026-11-20');
    await page.getByLabel('Name (optional)').fill('Polar fleets, autumn 2026');
    for (const name of ['Polar long-haul A', 'Polar long-haul B']) {
      const box = page.getByRole('checkbox', { name: new RegExp(name) });
      if (!(await box.isChecked())) await box.check();
    }
    await page.getByRole('button', { name: 'Build report' }).click();
    await page.waitForURL(/\/reports\/\d+$/, { timeout: 30_000 });
    await page.getByRole('heading', { level: 1, name: 'Polar fleets, autumn 2026' }).waitFor();
    await screenshot(page, 'analyst-report-detail');

    // Download the PDF as an attachment.
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Download PDF' }).click(),
    ]);
    expect(download.suggestedFilename()).toBe('Polar fleets, autumn 2026.pdf');
    fs.mkdirSync(OUTPUT, { recursive: true });
    const saved = path.join(OUTPUT, 'analyst-report.pdf');
    await download.saveAs(saved);
    expect(fs.readFileSync(saved).subarray(0, 5).toString('latin1')).toBe('%PDF-');

    // Send it by e-mail and find it in the outbox with the PDF attached.
    const to = `board-${Date.now()}@example.test`;
    await page.getByLabel('Recipients').fill(`not-an-address, ${to}`);
    await page.getByRole('button', { name: 'Send the PDF' }).click();
    await page.locator('#send-recipients-error').filter({ hasText: 'not-an-address' }).waitFor();
    await page.getByLabel('Recipients').fill(to);
    await page.getByLabel('Note (optional)').fill('For the quarterly review.');
    await page.getByRole('button', { name: 'Send the PDF' }).click();
    // The request only queues it: the history shows it queued, the background job sends it.
    await page
      .getByRole('status')
      .filter({ hasText: `Queued for ${to}` })
      .waitFor();
    const history = page.getByRole('list', { name: 'E-mail history' });
    const entry = history.getByRole('listitem').filter({ hasText: `To ${to}` });
    await entry.waitFor();
    // Refresh until the job has sent it (the in-process runner wakes on the queued job).
    let sent = false;
    for (let i = 0; i < 40 && !sent; i++) {
      sent = (await entry.innerText()).startsWith('Sent');
      if (!sent) {
        await page.waitForTimeout(250);
        await page.getByRole('link', { name: 'Refresh' }).click();
        await history.waitFor();
      }
    }
    expect(await entry.innerText()).toMatch(/^Sent /);
    await screenshot(page, 'analyst-report-sent');
    const [mail] = await mailTo(to);
    expect(mail.subject).toBe('Fleet report: Polar fleets, autumn 2026');
    expect(mail.attachments).toEqual([
      expect.objectContaining({ filename: 'polar-fleets-autumn-2026.pdf', contentType: 'application/pdf' }),
    ]);

    await page.goto(`/w/${SLUG}/reports`);
    await page.getByRole('link', { name: 'Polar fleets, autumn 2026' }).first().waitFor();
    await screenshot(page, 'analyst-report-list');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a planner sees the comparison but cannot manage fleets or build reports', async () => {
    const { page, context } = await newPage(browser(), { width: 900, height: 1100 });
    await signIn(page, 'planner@tropopass.test');
    await page.goto(`/w/${SLUG}/fleets`);
    await page.getByRole('heading', { level: 1, name: 'Fleets' }).waitFor();
    expect(await page.getByRole('button', { name: 'Create fleet' }).count()).toBe(0);
    await screenshot(page, 'planner-fleets-tablet');
    await page.goto(`/w/${SLUG}/reports`);
    expect(await page.getByRole('button', { name: 'Build report' }).count()).toBe(0);
    // The report the analyst built is readable, but a planner may not e-mail it.
    await page.getByRole('link', { name: 'Polar fleets, autumn 2026' }).first().click();
    await page.getByRole('heading', { level: 1, name: 'Polar fleets, autumn 2026' }).waitFor();
    expect(await page.getByRole('button', { name: 'Send the PDF' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Delete report' }).count()).toBe(0);
    await page.getByRole('link', { name: 'Download PDF' }).waitFor();
    await screenshot(page, 'planner-report-tablet');
    await context.close();
  });

  it('at phone width the comparison table follows its options with no empty band between them', async () => {
    const { page, context, errors } = await newPage(browser(), { width: 390, height: 844 });
    await signIn(page, 'analyst@tropopass.test');
    await page.goto(`/w/${SLUG}/fleets`);
    const region = page.getByRole('region', { name: 'Fleet comparison table' });
    await region.getByRole('cell', { name: 'All fleets' }).waitFor();
    const columns = await page.getByText(/^Columns \(\d+ of \d+\)$/).boundingBox();
    const table = await region.boundingBox();
    if (!columns || !table) throw new Error('the column chooser or the table is not laid out');
    // Only the card's own spacing (16 px) lies between them, whatever the title's length.
    expect(table.y - (columns.y + columns.height)).toBeLessThanOrEqual(24);
    await screenshot(page, 'analyst-fleets-phone');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('an analyst deletes a report after confirming; the list no longer shows it', async () => {
    const { page, context } = await newPage(browser());
    await signIn(page, 'analyst@tropopass.test');
    await page.goto(`/w/${SLUG}/reports`);
    await page.getByLabel('Period from').fill('2026-10-01');
    await page.getByLabel('Period to').fill('2026-10-31');
    await page.getByLabel('Name (optional)').fill('Draft to discard');
    await page.getByRole('button', { name: 'Build report' }).click();
    await page.waitForURL(/\/reports\/\d+$/, { timeout: 30_000 });
    const url = page.url();
    // Dismissing the confirmation keeps it; accepting deletes it.
    page.once('dialog', (d) => void d.dismiss());
    await page.getByRole('button', { name: 'Delete report' }).click();
    await page.reload();
    await page.getByRole('heading', { level: 1, name: 'Draft to discard' }).waitFor();
    page.once('dialog', (d) => {
      expect(d.message()).toMatch(/Delete the report “Draft to discard”/);
      void d.accept();
    });
    await page.getByRole('button', { name: 'Delete report' }).click();
    await page.waitForURL(/\/reports$/, { timeout: 30_000 });
    await page.getByRole('link', { name: 'Polar fleets, autumn 2026' }).first().waitFor();
    expect(await page.getByRole('link', { name: 'Draft to discard' }).count()).toBe(0);
    // The workspace layout checks the item before the loading screen streams, so this is a real 404.
    expect((await page.goto(url))?.status()).toBe(404);
    await page.getByRole('heading', { level: 1, name: 'Not found' }).waitFor();
    await context.close();
  });
});
