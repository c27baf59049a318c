import { describe, expect, it } from 'vitest';
import { newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();

describe("the consultant's portfolio", () => {
  it('names each count, shows each client at a glance and copies a library from one client to another', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'consultant@tropopass.test');
    await page.goto('/workspaces');
    await page.getByRole('heading', { level: 1, name: 'Workspaces' }).waitFor();
    const header = (await page.locator('thead').first().textContent()) ?? '';
    for (const label of ['Saved screenings', 'Imported flights screened', 'Billable units', 'this billing period'])
      expect(header).toContain(label);

    // Billable units here are the billing page's figure for the same workspace.
    const row = page.locator('tr').filter({ hasText: 'skarn-polar' });
    const units = (await row.getByTestId('portfolio-billable-units-count').textContent()) ?? '';
    const usage = await page.request.get('/api/v1/workspaces/skarn-polar/usage');
    expect(usage.status()).toBe(200);
    expect(units.replace(/[^\d]/g, '')).toBe(String(((await usage.json()) as { units: number }).units));

    const card = page.getByTestId('client-skarn-polar');
    await card.waitFor();
    expect(await card.getByTestId('client-billing').textContent()).toBe('Active');
    expect(await card.getByTestId('client-trend').locator('tbody tr').count()).toBe(2);
    // Months read as months ("Nov 2026"), not as a day ("26-11").
    const months = await card.getByTestId('client-trend').locator('thead th[scope="col"]').allTextContents();
    expect(
      months.slice(1).every((m) => /^[A-Z][a-z]{2} \d{4}$/.test(m.trim())),
      months.join(', '),
    ).toBe(true);
    await card.getByTestId('client-imports').waitFor();
    await card.getByTestId('client-last-report').waitFor();
    await screenshot(page, 'portfolio-clients');

    await page.getByLabel('From').selectOption('skarn-polar');
    await page.getByLabel('To').selectOption('velloway-jets');
    await page.getByRole('button', { name: 'Copy library' }).click();
    const done = page.getByRole('status').filter({ hasText: /From .* to .*: \d+ engines copied/ });
    await done.waitFor();
    await screenshot(page, 'portfolio-library-copied');

    await page.goto('/w/velloway-jets/engines');
    await page.getByText('SK-LR1').first().waitFor();
    expect(errors).toEqual([]);
    await context.close();
  });
});
