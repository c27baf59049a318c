import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();

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

describe('a planner screens a filed flight plan', () => {
  it('pastes an item-15 route through the demo fixes and airway, sees what was read and not found, saves it, and finds the points in the library', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'planner@tropopass.test');
    await page.goto('/w/skarn-polar/screen');
    await page.getByRole('heading', { level: 1, name: 'Screen a flight' }).waitFor();
    await page
      .locator('label')
      .filter({ hasText: /^Flight plan$/ })
      .click();
    await expect(page.getByRole('radio', { name: 'Flight plan' }).isChecked()).resolves.toBe(true);
    await pickAirport(page, 'Departure', 'ENGM');
    await pickAirport(page, 'Destination', 'CYVR');
    await page.getByLabel('Aircraft type', { exact: true }).selectOption('SK-LR1');
    await page.getByLabel('Cruise fuel burn (kg)').fill('61000');
    const text = page.getByLabel('Route (item 15)');
    await text.fill('N0480F370 DCT QXFRO XA2 QXIKE/N0480F390 XA2 QXELM DCT NOWHR DCT');
    const items = page.getByTestId('flight-plan-items');
    await items.getByText('QXIKE/N0480F390').waitFor({ timeout: 20_000 });
    expect(await items.getByText('QXFRO').first().textContent()).toContain('looked up');
    expect(await items.getByText('NOWHR').textContent()).toContain('not found');
    expect(await page.getByTestId('flight-plan-unresolved').textContent()).toContain(
      'NOWHR is not in the fix library.',
    );
    await page.getByTestId('preview-status').filter({ hasText: 'Up to date' }).waitFor({ timeout: 20_000 });
    await screenshot(page, 'flight-plan-screen');

    await page.getByLabel('Name (optional)').fill('ENGM-CYVR filed plan');
    await page.getByRole('button', { name: 'Save screening' }).click();
    await page.waitForURL(/\/w\/skarn-polar\/screenings\/\d+$/, { timeout: 20_000 });
    await page.getByRole('heading', { level: 1, name: 'ENGM-CYVR filed plan' }).waitFor();
    await page.getByText('ENGM → CYVR (flight plan)').first().waitFor();
    await page.getByText('NOWHR', { exact: false }).first().waitFor();
    await screenshot(page, 'flight-plan-result');

    await page.goto('/w/skarn-polar/fixes?q=QXE');
    await page.getByRole('heading', { level: 1, name: 'Fixes & airways' }).waitFor();
    expect(await page.getByRole('cell', { name: 'QXELM', exact: true }).count()).toBe(2);
    await screenshot(page, 'fixes-library');
    expect(errors).toEqual([]);
    await context.close();
  });
});
