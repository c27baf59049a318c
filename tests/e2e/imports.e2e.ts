import { describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();

const HEADER = 'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg,steps,fleet,remarks';
const GOOD = [
  '2026-11-10,E2E101,EFHK,RJAA,SK-LR1,350,49800,350@0 370@2600 390@5100,,crew swap',
  '2026-11-10,E2E102,RJAA,HEL,SK-LR1,FL360,50600,,,',
  '2026-11-11,E2E211,LHR,SEA,SK-LR2,370,54700,,Polar long-haul A,',
  '2026-11-12,E2E417,KEF,ANC,SK-LR2,390,37900,,,',
];
const BAD_ROW = '2026-11-12,E2E418,ANC,KEF,SK-LR9,390,37900,,,';
const FIXED_ROW = '2026-11-12,E2E418,ANC,KEF,SK-LR2,390,37900,,,';
const csv = (rows: string[]) => Buffer.from([HEADER, ...rows].join('\r\n') + '\r\n', 'utf8');

describe('schedule import journey (analyst, skarn-polar)', () => {
  it('a bad row is refused with its line and column; the fixed file is screened and its flights listed', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'analyst@tropopass.test');
    await page.goto('/w/skarn-polar/imports');
    await page.getByRole('heading', { level: 1, name: 'Schedule imports' }).waitFor();
    // The demo seed's monthly imports are listed and complete.
    expect(await page.getByTestId('import-status').filter({ hasText: 'Complete' }).count()).toBeGreaterThanOrEqual(3);
    await screenshot(page, 'imports-page');

    await page.setInputFiles('#schedule-file', {
      name: 'november-extra.csv',
      mimeType: 'text/csv',
      buffer: csv([...GOOD, BAD_ROW]),
    });
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByRole('alert').filter({ hasText: 'Nothing was imported' }).waitFor();
    const problems = page.getByRole('table', { name: 'Problems in the uploaded file' });
    const cells = await problems.locator('tbody tr').first().locator('td').allTextContents();
    expect(cells[0]).toBe('6');
    expect(cells[1]).toBe('aircraft');
    expect(cells[2]).toContain('SK-LR9');
    expect(await page.getByRole('table', { name: 'Notes on the uploaded file' }).textContent()).toContain('remarks');
    await screenshot(page, 'imports-refused');

    await page.setInputFiles('#schedule-file', {
      name: 'november-extra.csv',
      mimeType: 'text/csv',
      buffer: csv([...GOOD, FIXED_ROW]),
    });
    await page.getByRole('button', { name: 'Check the file' }).click();
    // Nothing is saved before the estimate is confirmed: 5 billable units at the workspace's per-flight price.
    const estimate = page.getByTestId('import-estimate');
    await estimate.waitFor();
    expect(await estimate.textContent()).toMatch(/up to 5 billable units .*estimated \$\d+\.\d\d/);
    await screenshot(page, 'imports-estimate');
    await page.getByRole('button', { name: 'Import 5 flights' }).click();
    await page.getByRole('status').filter({ hasText: 'Accepted: 5 flights queued for screening' }).waitFor();
    const item = page.locator('li[data-testid^="import-"]').filter({ hasText: 'november-extra.csv' });
    await item.waitFor();
    await screenshot(page, 'imports-accepted');
    await item.getByTestId('import-status').filter({ hasText: 'Complete' }).waitFor({ timeout: 30_000 });
    expect(await item.textContent()).toContain('5 flights screened');
    await screenshot(page, 'imports-complete');

    await item.getByRole('link', { name: 'Show its flights' }).click();
    await page.waitForURL(/\/w\/skarn-polar\/flights\?import=\d+/);
    const table = page.getByRole('table', { name: 'Flights and their screening figures' });
    await table.waitFor();
    const text = (await table.textContent()) ?? '';
    for (const flight of ['E2E101', 'E2E102', 'E2E211', 'E2E417', 'E2E418']) expect(text).toContain(flight);
    expect(text).toContain('EGLL → KSEA');
    expect(text).not.toContain('Waiting to be screened');
    expect(await page.locator('tbody tr').count()).toBe(5);
    await page.getByText('Screening estimate').first().waitFor();
    await screenshot(page, 'flights-of-import');
    // The browser logs the refused upload's 422 as a failed resource; that refusal is the point of this journey.
    expect(errors.filter((e) => !/status of 422/.test(e))).toEqual([]);
    await context.close();
  });

  it('the flights page filters by fleet and reads at tablet width; deleting an import says billed units stay billed', async () => {
    const { page, context, errors } = await newPage(browser(), { width: 820, height: 1100 });
    await signIn(page, 'analyst@tropopass.test');
    await page.goto('/w/skarn-polar/flights');
    await page.getByLabel('Fleet').selectOption({ label: 'Polar long-haul B' });
    await page.getByRole('button', { name: 'Filter' }).click();
    await page.waitForURL(/fleet=\d+/);
    const rows = await page.locator('tbody tr').allTextContents();
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect(r).toContain('SK-LR2');
    await screenshot(page, 'flights-tablet-fleet-filter');
    await page.screenshot({ path: 'tests/e2e/output/flights-tablet-top.png' });

    await page.goto('/w/skarn-polar/imports');
    await page.screenshot({ path: 'tests/e2e/output/imports-tablet-top.png' });
    const item = page.locator('li[data-testid^="import-"]').filter({ hasText: 'november-extra.csv' });
    await item.getByRole('button', { name: /Delete import/ }).click();
    const confirm = item.getByRole('group', { name: /Confirm deleting import/ });
    expect(await confirm.textContent()).toContain('stay billed');
    await screenshot(page, 'imports-delete-confirm');
    await confirm.getByRole('button', { name: 'Delete import and flights' }).click();
    await page.getByRole('status').filter({ hasText: 'already billed stay billed' }).waitFor();
    await item.waitFor({ state: 'detached' });
    await screenshot(page, 'imports-deleted');
    expect(await page.getByRole('heading', { name: 'Background jobs' }).count(), 'owners only').toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('an owner sees a failed background job with its reason and queues it again', async () => {
    const file = process.env.SQLITE_FILE;
    expect(file, 'the e2e runner sets SQLITE_FILE').toBeTruthy();
    const sqlite = new Database(file!);
    try {
      const ws = sqlite.prepare('SELECT id FROM workspaces WHERE slug = ?').get('skarn-polar') as { id: number };
      // A report e-mail whose report is gone by now: the retried job finds nothing to send and ends.
      sqlite
        .prepare(
          'INSERT INTO job_failures (workspace_id, job_name, payload_json, reason, attempts, failed_at) VALUES (?, ?, ?, ?, ?, ?)',
        )
        .run(
          ws.id,
          'report.redeliver',
          JSON.stringify({
            workspaceId: ws.id,
            reportId: 987654,
            recipients: ['board@example.test'],
            sentBy: null,
            senderName: 'E2E',
            actor: 'e2e',
          }),
          'The mail server did not accept the report e-mail.',
          5,
          new Date().toISOString(),
        );
    } finally {
      sqlite.close();
    }
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'consultant@tropopass.test');
    await page.goto('/w/skarn-polar/imports#background-jobs');
    const section = page.locator('#background-jobs');
    await section.getByRole('heading', { name: 'Background jobs' }).waitFor();
    const row = section.locator('tr').filter({ hasText: 'E-mail of report #987654 to 1 recipient' });
    expect(await row.textContent()).toContain('The mail server did not accept the report e-mail.');
    await screenshot(page, 'imports-background-jobs');
    await row.getByRole('button', { name: /Retry/ }).click();
    await section.getByRole('status').filter({ hasText: 'queued again' }).waitFor();
    await row.waitFor({ state: 'detached' });
    expect(errors).toEqual([]);
    await context.close();
  });
});
