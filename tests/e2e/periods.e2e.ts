import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { strFromU8, unzipSync } from 'fflate';
import { mailTo, newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();
const SLUG = 'skarn-polar';
// The demo's flights run over the three months up to DEMO_TODAY (2026-11-20): September is in Q3.
const QUARTER = '2026-Q3';

describe('reporting periods: an analyst prepares a quarter, an owner signs it, a viewer downloads the audit pack', () => {
  it('runs the whole journey', async () => {
    // The analyst opens the quarter from the periods list and moves it to review.
    const analyst = await newPage(browser());
    await signIn(analyst.page, 'analyst@tropopass.test');
    await analyst.page.goto(`/w/${SLUG}/periods`);
    await analyst.page.getByRole('heading', { level: 1, name: 'Periods & sign-off' }).waitFor();
    await analyst.page.getByRole('link', { name: 'Q3 2026', exact: true }).click();
    await analyst.page.waitForURL(new RegExp(`/periods/${QUARTER}$`));
    await analyst.page.getByRole('heading', { level: 1, name: /Q3 2026/ }).waitFor();
    const flights = Number((await analyst.page.getByTestId('period-flights').textContent())?.replace(/\D/g, ''));
    expect(flights).toBeGreaterThan(0);
    // The analyst may not sign: only the review is offered.
    await expect(analyst.page.getByRole('button', { name: 'Sign the period' }).count()).resolves.toBe(0);
    await analyst.page.getByRole('button', { name: 'Move to review' }).click();
    await analyst.page.getByRole('status').filter({ hasText: 'its figures are frozen' }).waitFor();
    await analyst.page.getByTestId('period-state').first().filter({ hasText: 'In review' }).waitFor();
    await analyst.page.getByRole('heading', { name: /Frozen flights/ }).waitFor();
    await screenshot(analyst.page, 'periods-in-review');
    expect(analyst.errors).toEqual([]);
    await analyst.context.close();

    // The owner signs it, then invites a read-only member.
    const owner = await newPage(browser());
    await signIn(owner.page, 'consultant@tropopass.test');
    await owner.page.goto(`/w/${SLUG}/periods/${QUARTER}`);
    await owner.page.getByRole('button', { name: 'Sign the period' }).click();
    await owner.page.getByRole('status').filter({ hasText: 'signed' }).waitFor();
    await owner.page.getByTestId('period-state').first().filter({ hasText: 'Signed' }).waitFor();
    const hash = ((await owner.page.getByTestId('sign-hash').textContent()) ?? '').trim();
    expect(hash).toMatch(/^[0-9a-f]{64}$/);
    await expect(owner.page.getByTestId('signed-by').textContent()).resolves.toMatch(/by /);
    await screenshot(owner.page, 'periods-signed');
    // The fleet comparison set to the signed quarter says its figures are frozen elsewhere.
    await owner.page.goto(`/w/${SLUG}/fleets`);
    await owner.page.getByLabel('Reporting period').selectOption(QUARTER);
    await owner.page.waitForURL(/from=2026-07-01&to=2026-09-30/);
    await owner.page.getByText('Q3 2026 is signed').waitFor();
    // The overview set to the current quarter shows the demo's targets against its running figures.
    await owner.page.goto(`/w/${SLUG}?period=2026-Q4`);
    await owner.page
      .getByTestId('overview-targets')
      .getByText(/Share above/)
      .waitFor();
    await owner.page.goto(`/w/${SLUG}/settings/members`);
    await owner.page.getByLabel('E-mail', { exact: true }).fill('viewer@tropopass.test');
    await owner.page.getByLabel('Role', { exact: true }).selectOption('viewer');
    await owner.page.getByRole('button', { name: 'Send invitation' }).click();
    await owner.page.getByRole('status').filter({ hasText: 'Invitation sent' }).waitFor();

    // The viewer accepts and downloads the audit pack of the signed quarter.
    const invite = (await mailTo('viewer@tropopass.test')).find((m) => /invited to/.test(m.subject));
    const link = /\/invite\/[^\s]+/.exec(invite?.text ?? '')?.[0];
    expect(link).toBeTruthy();
    const viewer = await newPage(browser());
    await signIn(viewer.page, 'viewer@tropopass.test');
    await viewer.page.goto(link!);
    await viewer.page.getByRole('button', { name: 'Accept and open the workspace' }).click();
    await viewer.page.waitForURL(new RegExp(`/w/${SLUG}`));
    await viewer.page.goto(`/w/${SLUG}/periods/${QUARTER}`);
    await expect(viewer.page.getByRole('button', { name: 'Move to review' }).count()).resolves.toBe(0);
    await expect(viewer.page.getByRole('button', { name: /Reopen/ }).count()).resolves.toBe(0);
    const [download] = await Promise.all([
      viewer.page.waitForEvent('download'),
      viewer.page.getByTestId('audit-pack').click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/audit pack\.zip$/);
    const file = await download.path();
    const files = unzipSync(new Uint8Array(fs.readFileSync(file)));
    expect(Object.keys(files).sort()).toEqual([
      'changes-after-sign-off.csv',
      'flights.csv',
      'method-notes.txt',
      'report.pdf',
      'sign-off.json',
    ]);
    const record = JSON.parse(strFromU8(files['sign-off.json'])) as { sha256: string; flights: number };
    expect(record.sha256).toBe(hash);
    expect(createHash('sha256').update(files['flights.csv']).digest('hex')).toBe(hash);
    expect(strFromU8(files['flights.csv']).trim().split('\r\n')).toHaveLength(record.flights + 1);
    expect(strFromU8(files['report.pdf'].subarray(0, 5))).toBe('%PDF-');
    await screenshot(viewer.page, 'periods-viewer');
    expect(viewer.errors).toEqual([]);
    await viewer.context.close();

    // The audit done, the owner takes the read-only access back (the demo viewer keeps one workspace).
    await owner.page.goto(`/w/${SLUG}/settings/members`);
    const row = owner.page.getByRole('row').filter({ hasText: 'viewer@tropopass.test' });
    owner.page.once('dialog', (d) => void d.accept());
    await row.getByRole('button', { name: 'Remove' }).click();
    await row.waitFor({ state: 'detached' });
    expect(owner.errors).toEqual([]);
    await owner.context.close();
  });
});
