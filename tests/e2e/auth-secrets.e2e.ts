import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page, Route } from 'playwright-core';
import { BASE_URL, DEMO_PASSWORD, finishSignUp, mailTo, newPage, signIn, useBrowser } from './support/browser';

const { browser } = useBrowser();
const PAYMENT_URL = process.env.E2E_PAYMENT_URL ?? 'http://127.0.0.1:12111';
const SERVER_LOG = process.env.E2E_SERVER_LOG ?? '';
const DEEP = '/w/skarn-polar/fleets?from=2026-10-01';

/** A context that records every URL the browser asks for or navigates to. */
async function recordingContext(
  b: Browser,
  opts: { javaScriptEnabled?: boolean } = {},
): Promise<{ context: BrowserContext; page: Page; urls: string[] }> {
  const context = await b.newContext({ baseURL: BASE_URL, javaScriptEnabled: opts.javaScriptEnabled ?? true });
  const urls: string[] = [];
  context.on('request', (r) => urls.push(r.url()));
  const page = await context.newPage();
  page.on('framenavigated', (f) => urls.push(f.url()));
  return { context, page, urls };
}

/** Holds the page's scripts until released: what a slow phone sees before hydration. */
async function holdScripts(page: Page): Promise<() => Promise<void>> {
  const held: Route[] = [];
  await page.route('**/_next/static/**/*.js', (route) => void held.push(route));
  return async () => {
    await page.unroute('**/_next/static/**/*.js');
    await Promise.all(held.map((r) => r.continue().catch(() => undefined)));
  };
}

function expectNoSecret(where: string[], secrets: string[]): void {
  for (const s of secrets) {
    const forms = [s, encodeURIComponent(s), encodeURIComponent(s).replace(/%20/g, '+')];
    const leaks = where.filter((u) => forms.some((f) => u.includes(f)));
    expect(leaks, `secret found in ${leaks.join(', ')}`).toEqual([]);
  }
}

function serverLog(): string[] {
  return SERVER_LOG && fs.existsSync(SERVER_LOG) ? fs.readFileSync(SERVER_LOG, 'utf8').split('\n') : [];
}

const unique = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;

async function submitSignIn(page: Page, email: string, password: string): Promise<void> {
  await page.locator('#email').fill(email);
  await page.locator('#password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

describe('credentials never in a URL', () => {
  it('with script disabled: sign-up, sign-in with a deep link, reset and API-key creation all post, and no secret reaches a URL or the server log', async () => {
    const { context, page, urls } = await recordingContext(browser(), { javaScriptEnabled: false });
    const email = `nojs-${unique()}@operator.example`;
    const first = `Lantern-${unique()}-quill`;
    const second = `Harbour-${unique()}-moss`;

    await page.goto('/signup');
    await page.locator('#name').fill('Ines Nojs');
    await page.locator('#email').fill(email);
    await page.locator('#password').fill(first);
    await page.locator('#workspaceName').fill(`No script ${unique()}`);
    await page.getByRole('button', { name: 'Create account' }).click();
    await finishSignUp(page, email);
    expect(new URL(page.url()).pathname).toMatch(/^\/w\//);
    const slug = new URL(page.url()).pathname.split('/')[2];

    await page.goto(`/w/${slug}/settings/api-keys`);
    await page.locator('#key-name').fill('dispatch');
    await page.getByRole('button', { name: 'Create key' }).click();
    const key = (await page.getByTestId('new-api-key').textContent())?.trim() ?? '';
    expect(key).toMatch(/^tpk_/);

    await context.clearCookies();
    await page.goto('/reset');
    await page.locator('#email').fill(email);
    await page.getByRole('button', { name: 'Send the reset link' }).click();
    await page.getByText('Check your e-mail').waitFor();
    const resetMail = (await mailTo(email)).find((m) => /\/reset\/\S+/.test(m.text));
    const link = /(https?:\/\/\S+\/reset\/\S+)/.exec(resetMail?.text ?? '')?.[1] ?? '';
    expect(link).not.toBe('');
    await page.goto(link);
    await page.locator('#password').fill(second);
    await page.locator('#confirm').fill(second);
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await page.waitForURL((u) => u.pathname === '/signin' && u.searchParams.get('reset') === '1');

    await page.goto(`/w/${slug}/fleets?from=2026-10-01`);
    await page.waitForURL((u) => u.pathname === '/signin');
    expect(new URL(page.url()).searchParams.get('callbackUrl')).toBe(`/w/${slug}/fleets?from=2026-10-01`);
    await submitSignIn(page, email, first);
    await page.getByText('That e-mail and password do not match an account.').waitFor();
    await submitSignIn(page, email, second);
    await page.waitForURL((u) => u.pathname === `/w/${slug}/fleets`);
    expect(new URL(page.url()).search).toBe('?from=2026-10-01');

    expectNoSecret(urls, [first, second, key]);
    expectNoSecret(serverLog(), [first, second, key]);
    await context.close();
  });

  it('before hydration: the sign-in form posts, keeps the deep link, and the password stays out of every URL', async () => {
    const { context, page, urls } = await recordingContext(browser());
    const release = await holdScripts(page);
    await page.goto(`/signin?callbackUrl=${encodeURIComponent(DEEP)}`, { waitUntil: 'commit' });
    await page.locator('#password').waitFor();
    await submitSignIn(page, 'analyst@tropopass.test', DEMO_PASSWORD);
    // Scripts are still held, so the new page never reaches "load": wait for the navigation itself.
    await page.waitForURL((u) => u.pathname === '/w/skarn-polar/fleets', { timeout: 20_000, waitUntil: 'commit' });
    await release();
    expect(new URL(page.url()).search).toBe('?from=2026-10-01');
    expectNoSecret(urls, [DEMO_PASSWORD]);
    expectNoSecret(serverLog(), [DEMO_PASSWORD]);
    await context.close();
  });
});

describe('where sign-in lands', () => {
  it('a foreign callback is dropped: the browser stays on the app after a genuine sign-in', async () => {
    for (const cb of ['//evil.example/', '/\\evil.example/', '/%09/evil.example']) {
      const { context, page, urls } = await recordingContext(browser());
      await page.goto(`/signin?callbackUrl=${encodeURIComponent(cb)}`);
      expect(new URL(page.url()).searchParams.has('callbackUrl')).toBe(false);
      await submitSignIn(page, 'planner@tropopass.test', DEMO_PASSWORD);
      await page.waitForURL((u) => u.pathname.startsWith('/w/'));
      expect(urls.filter((u) => u.includes('evil.example') && !u.startsWith(BASE_URL))).toEqual([]);
      await context.close();
    }
  });

  it('a finance admin following a flight-data link lands on billing with the reason; a signed-in visit to sign-in goes to the landing', async () => {
    const { context, page } = await newPage(browser());
    await page.goto(`/signin?callbackUrl=${encodeURIComponent(DEEP)}`);
    await submitSignIn(page, 'billing@tropopass.test', DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/w/skarn-polar/settings/billing');
    await page.getByText(/not part of your role \(Finance admin\)/).waitFor();
    await page.goto('/w/skarn-polar');
    expect(new URL(page.url()).pathname).toBe('/w/skarn-polar/settings/billing');
    await page.goto('/signin');
    expect(new URL(page.url()).pathname).toBe('/w/skarn-polar/settings/billing');
    await context.close();
  });
});

describe('status codes of pages with a loading screen', () => {
  it('a page outside the role answers 403 and a missing item 404, not 200', async () => {
    const { context, page } = await newPage(browser());
    await signIn(page, 'billing@tropopass.test');
    expect((await page.request.get('/w/skarn-polar/fleets')).status()).toBe(403);
    expect((await page.request.get('/w/skarn-polar/engines')).status()).toBe(403);
    await context.close();
    const analyst = await newPage(browser());
    await signIn(analyst.page, 'analyst@tropopass.test');
    expect((await analyst.page.request.get('/w/skarn-polar/fleets')).status()).toBe(200);
    for (const p of [
      'engines/999999',
      'engines/aircraft/999999',
      'routes/999999',
      'soundings/999999',
      'reports/999999',
    ]) {
      expect((await analyst.page.request.get(`/w/skarn-polar/${p}`)).status(), p).toBe(404);
    }
    await analyst.context.close();
  });
});

describe('sign-out ends the session', () => {
  it('a cookie saved before sign-out is refused by pages and route handlers afterwards', async () => {
    const { context, page } = await newPage(browser());
    await signIn(page, 'analyst@tropopass.test');
    const saved = await context.cookies();
    await page.locator('summary', { hasText: 'account menu' }).click();
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL((u) => u.pathname === '/signin');
    await context.close();

    const replay = await browser().newContext({ baseURL: BASE_URL });
    await replay.addCookies(saved);
    const again = await replay.newPage();
    await again.goto('/w/skarn-polar/screenings');
    expect(new URL(again.url()).pathname).toBe('/signin');
    expect((await again.request.get('/api/v1/workspaces')).status()).toBe(401);
    await replay.close();
  });
});

describe('payment errors through the running app', () => {
  it('an unknown invoice is 404 and a declined card when paying is 402, never 500', async () => {
    const { page, context } = await newPage(browser());
    await signIn(page, 'consultant@tropopass.test');
    const unknown = await page.request.get('/api/v1/workspaces/skarn-polar/invoices/in_doesnotexist123/pdf');
    expect(unknown.status()).toBe(404);

    const created = await page.request.post('/api/v1/workspaces', { data: { name: `Declined ${unique()}` } });
    expect(created.status()).toBe(201);
    const { slug } = (await created.json()) as { slug: string };
    await page.goto(`/w/${slug}/settings/billing`);
    await page.getByLabel('Card on file').selectOption({ label: 'Test card that is declined' });
    await page.getByRole('radio', { name: /Crew/ }).check();
    await page.getByRole('button', { name: 'Subscribe to Crew' }).click();
    await page.getByRole('heading', { name: 'Change plan' }).waitFor();
    const state = (await (await fetch(`${PAYMENT_URL}/_fake/state`)).json()) as {
      customers: { id: string; metadata: Record<string, string> }[];
      subscriptions: { id: string; customer: string }[];
    };
    const customer = state.customers.find((c) => c.metadata.workspace === slug)!;
    const subscription = state.subscriptions.find((s) => s.customer === customer.id)!.id;
    const advance = async () => {
      const r = await fetch(`${PAYMENT_URL}/_fake/advance`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ subscription, wait: true }),
      });
      expect(r.status).toBe(200);
    };
    await advance();
    const flight = {
      route: { waypoints: [{ airport: 'ENGM' }, { airport: 'RJAA' }] },
      cruise: { flightLevel: 350 },
      fuelBurnKg: 70_000,
      emission: { eiNoxGPerKg: 15 },
      month: 1,
    };
    expect((await page.request.post(`/api/v1/workspaces/${slug}/screenings`, { data: flight })).status()).toBe(201);
    for (let i = 0; i < 80; i++) {
      const u = (await (await page.request.get(`/api/v1/workspaces/${slug}/usage`)).json()) as { pendingUnits: number };
      if (u.pendingUnits === 0) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    await advance();
    const pay = await page.request.post(`/api/v1/workspaces/${slug}/billing/invoices/pay`, { data: {} });
    expect(pay.status()).toBe(402);
    expect(((await pay.json()) as { error: { code: string } }).error.code).toBe('payment_required');
    await context.close();
  });
});
