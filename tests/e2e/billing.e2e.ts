import fs from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { mailTo, newPage, screenshot, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();
const PAYMENT_URL = process.env.E2E_PAYMENT_URL ?? 'http://127.0.0.1:12111';
const SLUG = 'skarn-polar';

const FLIGHT = {
  route: { waypoints: [{ airport: 'ENGM' }, { airport: 'RJAA' }] },
  cruise: { flightLevel: 350 },
  fuelBurnKg: 70_000,
  emission: { eiNoxGPerKg: 15 },
  month: 1,
};

interface FakeState {
  customers: { id: string; metadata: Record<string, string> }[];
  subscriptions: { id: string; customer: string; status: string }[];
}

async function until<T>(fn: () => Promise<T | null | undefined | false>, what: string, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** The demo workspace's subscription, once the app has provisioned it in the payment fake. */
async function demoSubscription(): Promise<string> {
  return until(async () => {
    const state = (await (await fetch(`${PAYMENT_URL}/_fake/state`)).json()) as FakeState;
    const customer = state.customers.find((c) => c.metadata.workspace === SLUG);
    return customer
      ? state.subscriptions.find((s) => s.customer === customer.id && s.status === 'active')?.id
      : undefined;
  }, 'the demo subscription');
}

type Usage = { units: number; pendingUnits: number; estimatedChargeCents: number; planId: string };

async function usageOf(page: Page, slug = SLUG): Promise<Usage> {
  const res = await page.request.get(`/api/v1/workspaces/${slug}/usage`);
  expect(res.status()).toBe(200);
  return (await res.json()) as Usage;
}

const AXE_SOURCE = fs.readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

/** Serious or critical axe-core (WCAG 2.1 A/AA) findings on the page as it is now. */
async function axeFindings(page: Page): Promise<string[]> {
  await page.evaluate(AXE_SOURCE);
  const violations = await page.evaluate(async () => {
    const w = window as unknown as {
      axe: {
        run: (
          ctx: Document,
          opts: object,
        ) => Promise<{ violations: { id: string; impact: string | null; nodes: { target: string[] }[] }[] }>;
      };
    };
    return (
      await w.axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } })
    ).violations;
  });
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id} at ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);
}

/** Elements reaching past the right edge of the viewport (a page that scrolls sideways). */
async function overflowing(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    const out: string[] = [];
    for (const el of Array.from(document.querySelectorAll('body *'))) {
      const r = el.getBoundingClientRect();
      if (r.width > 0 && r.right > width + 1) {
        let clipped = false;
        const positioned = getComputedStyle(el).position === 'absolute' || getComputedStyle(el).position === 'fixed';
        for (let p = positioned ? null : el.parentElement; p; p = p.parentElement) {
          const o = getComputedStyle(p).overflowX;
          if (o === 'auto' || o === 'hidden' || o === 'scroll') {
            clipped = p.getBoundingClientRect().right <= width + 1;
            break;
          }
        }
        if (!clipped)
          out.push(
            `${el.tagName.toLowerCase()}.${(el.getAttribute('class') ?? '').split(' ').slice(0, 4).join('.')} right=${Math.round(r.right)}`,
          );
      }
    }
    return out.slice(0, 10);
  });
}

const usd = (cents: number) =>
  new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' }).format(cents / 100);

describe('finance admin: usage, invoice, plan', () => {
  it('sees usage and the estimate, downloads an invoice after the period closes, changes plan', async () => {
    const subscription = await demoSubscription();

    // A planner screens three flights in the workspace.
    const planner = await newPage(browser());
    await signIn(planner.page, 'planner@tropopass.test');
    for (let i = 0; i < 3; i++) {
      const r = await planner.page.request.post(`/api/v1/workspaces/${SLUG}/screenings`, {
        data: { ...FLIGHT, name: `Billing journey ${i + 1}` },
      });
      expect(r.status()).toBe(201);
    }
    await planner.context.close();

    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'billing@tropopass.test');
    expect(new URL(page.url()).pathname).toBe(`/w/${SLUG}/settings/billing`);
    await page.getByRole('heading', { level: 1, name: 'Billing' }).waitFor();
    expect(await page.getByTestId('billing-status').textContent()).toBe('Active');
    expect(await page.getByTestId('plan-name').textContent()).toBe('Fleet');

    // The sender delivers the new units; the meter (polling) shows them with the estimate.
    const usage = await until(async () => {
      const u = await usageOf(page);
      return u.units >= 3 && u.pendingUnits === 0 ? u : null;
    }, 'usage delivered to the payment service');
    await until(
      async () => (await page.getByTestId('usage-units').textContent()) === String(usage.units),
      'the meter to refresh',
    );
    expect(await page.getByTestId('usage-estimate').textContent()).toBe(usd(usage.estimatedChargeCents));
    await page.getByTestId('reconciliation').getByText('agree').waitFor();
    await screenshot(page, 'billing-usage');
    expect(await axeFindings(page)).toEqual([]);

    // The demo subscription started a month back: its first invoice is already issued, with a PDF.
    const seeded = page.getByTestId('invoice-row').first();
    await seeded.waitFor();
    const pdfHref = await seeded.locator('a[href$="/pdf"]').first().getAttribute('href');
    expect(pdfHref).toBeTruthy();
    const pdf = await page.request.get(pdfHref!);
    expect(pdf.status()).toBe(200);
    expect((await pdf.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-');

    // Close the period in the payment fake; the invoice is the estimate just shown.
    const advanced = await fetch(`${PAYMENT_URL}/_fake/advance`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ subscription, wait: true }),
    });
    expect(advanced.status).toBe(200);
    const { invoice } = (await advanced.json()) as { invoice: { amount_due: number; number: string } };
    expect(invoice.amount_due).toBe(usage.estimatedChargeCents);
    await page.reload();
    const row = page.getByTestId('invoice-row').filter({ hasText: invoice.number });
    await row.waitFor();
    expect(await row.textContent()).toContain(usd(invoice.amount_due));
    expect(await row.textContent()).toContain('Paid');

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      row.getByRole('link', { name: /Download PDF/ }).click(),
    ]);
    const file = await download.path();
    expect(download.suggestedFilename()).toMatch(/\.pdf$/);
    expect(fs.readFileSync(file).subarray(0, 5).toString('latin1')).toBe('%PDF-');

    // Change plan to Crew, by keyboard-reachable controls.
    await page.getByRole('radio', { name: /Crew/ }).check();
    await page.getByRole('button', { name: 'Change to Crew' }).click();
    await page.getByRole('status').filter({ hasText: 'Plan changed to Crew' }).waitFor();
    await until(async () => (await page.getByTestId('plan-name').textContent()) === 'Crew', 'the plan to show Crew');
    expect((await usageOf(page)).planId).toBe('crew');
    await screenshot(page, 'billing-after-plan-change');
    await page.setViewportSize({ width: 820, height: 1100 });
    await screenshot(page, 'billing-tablet');
    const sideways = await page.evaluate(
      () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
    );
    expect({ sideways, elements: sideways > 0 ? await overflowing(page) : [] }).toEqual({ sideways: 0, elements: [] });

    // Back to the seeded plan, so other journeys see the demo as seeded.
    await page.setViewportSize({ width: 1280, height: 900 });
    await page.getByRole('radio', { name: /Fleet/ }).check();
    await page.getByRole('button', { name: 'Change to Fleet' }).click();
    await page.getByRole('status').filter({ hasText: 'Plan changed to Fleet' }).waitFor();

    expect(errors).toEqual([]);

    // Never flight data for a finance admin (the browser logs the 403s below; they are the point).
    await page.goto(`/w/${SLUG}/screenings`);
    await page.getByRole('heading', { level: 1, name: 'Not part of your role' }).waitFor();
    expect(await page.getByText('Billing journey 1').count()).toBe(0);
    expect((await page.request.get(`/api/v1/workspaces/${SLUG}/screenings`)).status()).toBe(403);
    await context.close();

    // And the billing page is not for a planner.
    const again = await newPage(browser());
    await signIn(again.page, 'planner@tropopass.test');
    expect((await again.page.goto(`/w/${SLUG}/settings/billing`))?.status()).toBe(403);
    await again.context.close();
  });
});

describe('owner of a new workspace: trial, subscribe, a declined card and its recovery', () => {
  it('subscribes from the trial, goes past due on a declined card, is told by e-mail, pays and screens again', async () => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, 'consultant@tropopass.test');
    const name = `Billing journey ${Date.now()}`;
    const created = await page.request.post('/api/v1/workspaces', { data: { name } });
    expect(created.status()).toBe(201);
    const { slug } = (await created.json()) as { slug: string };

    await page.goto(`/w/${slug}/settings/billing`);
    expect(await page.getByTestId('billing-status').textContent()).toBe('Free trial');
    await page.getByText(/Free trial: 14 days left/).waitFor();
    await screenshot(page, 'billing-trial');

    await page.getByLabel('Card on file').selectOption({ label: 'Test card that is declined' });
    await page.getByRole('radio', { name: /Crew/ }).check();
    await page.getByRole('button', { name: 'Subscribe to Crew' }).click();
    // The action's confirmation and the refreshed page's notice both say so; the refresh can replace the
    // form (and its confirmation) before the confirmation is seen.
    await page
      .getByText(/Subscribed to Crew/)
      .first()
      .waitFor();
    await page.getByRole('heading', { name: 'Change plan' }).waitFor();

    // Close the free trial ($0), then a paid period with two screened flights on the declined card.
    const state = (await (await fetch(`${PAYMENT_URL}/_fake/state`)).json()) as FakeState;
    const customer = state.customers.find((c) => c.metadata.workspace === slug)!;
    const subscription = state.subscriptions.find((s) => s.customer === customer.id)!.id;
    const advance = async () => {
      const r = await fetch(`${PAYMENT_URL}/_fake/advance`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ subscription, wait: true }),
      });
      expect(r.status).toBe(200);
      return ((await r.json()) as { invoice: { amount_due: number; status: string } }).invoice;
    };
    expect(await advance()).toMatchObject({ amount_due: 0, status: 'paid' });
    for (let i = 0; i < 2; i++)
      expect((await page.request.post(`/api/v1/workspaces/${slug}/screenings`, { data: FLIGHT })).status()).toBe(201);
    await until(async () => (await usageOf(page, slug)).pendingUnits === 0 || null, 'usage delivered');
    const failed = await advance();
    expect(failed.status).toBe('open');

    await page.reload();
    expect(await page.getByTestId('billing-status').textContent()).toBe('Payment failed');
    await page.getByRole('alert').filter({ hasText: 'new screenings and imports are paused' }).waitFor();
    const blocked = await page.request.post(`/api/v1/workspaces/${slug}/screenings`, { data: FLIGHT });
    expect(blocked.status()).toBe(402);
    const mail = await until(
      async () =>
        (await mailTo('consultant@tropopass.test')).find(
          (m) => m.subject === `Payment failed for ${name}: screening is paused`,
        ),
      'the payment-failed e-mail',
    );
    expect(mail.text).toContain(usd(failed.amount_due));
    await screenshot(page, 'billing-past-due');

    await page.getByLabel('Card on file').selectOption({ label: 'Test card that succeeds' });
    await page.getByRole('button', { name: 'Save card' }).click();
    await page.getByRole('status').filter({ hasText: 'Test card that succeeds is on file' }).waitFor();
    await page.getByRole('button', { name: 'Pay the open invoice' }).click();
    await page.getByRole('status').filter({ hasText: 'Paid. Screening and imports are open again.' }).waitFor();
    await until(
      async () => (await page.getByTestId('billing-status').textContent()) === 'Active',
      'the status to show Active',
    );
    expect((await page.request.post(`/api/v1/workspaces/${slug}/screenings`, { data: FLIGHT })).status()).toBe(201);
    await screenshot(page, 'billing-recovered');
    expect(errors.filter((e) => !e.includes('402'))).toEqual([]);
    await context.close();
  });
});
