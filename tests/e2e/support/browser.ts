import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';

export const BASE_URL = process.env.E2E_BASE_URL ?? 'http://127.0.0.1:3000';
export const MAIL_URL = process.env.E2E_MAIL_URL ?? 'http://127.0.0.1:2580';
export const DEMO_PASSWORD = 'tropopass-demo';
const OUTPUT = path.resolve(process.cwd(), 'tests/e2e/output');

/** One Chromium per test file, launched with the flags this closed network needs. */
export function useBrowser(): { browser: () => Browser } {
  let browser: Browser;
  beforeAll(async () => {
    // playwright-core gives every launch a fresh, empty profile directory of its own.
    browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      headless: true,
      args: [
        '--no-sandbox',
        '--disable-gpu',
        '--disable-quic',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    });
  });
  afterAll(async () => {
    await browser?.close();
  });
  return { browser: () => browser };
}

export interface TrackedPage {
  context: BrowserContext;
  page: Page;
  /** Console errors and uncaught page errors seen so far. */
  errors: string[];
}

/**
 * Diagnostics for a journey run (both off by default): `E2E_VIEWPORT=390x844` opens every page at
 * that size, `E2E_LOG_FAILED=1` prints every answer of 400 or more with what asked for it (a router
 * prefetch, a client navigation, a document, a fetch) and the page it was asked from.
 */
const FORCED_VIEWPORT = /^(\d+)x(\d+)$/.exec(process.env.E2E_VIEWPORT ?? '');

export async function newPage(browser: Browser, viewport = { width: 1280, height: 900 }): Promise<TrackedPage> {
  const size = FORCED_VIEWPORT ? { width: Number(FORCED_VIEWPORT[1]), height: Number(FORCED_VIEWPORT[2]) } : viewport;
  const context = await browser.newContext({ baseURL: BASE_URL, viewport: size });
  const page = await context.newPage();
  const errors: string[] = [];
  if (process.env.E2E_LOG_FAILED === '1') {
    page.on('response', (r) => {
      if (r.status() < 400) return;
      const h = r.request().headers();
      const why = h['next-router-prefetch'] ? 'prefetch' : h['rsc'] ? 'client navigation' : r.request().resourceType();
      console.log(`[http ${r.status()}] ${r.request().method()} ${r.url()} (${why}) from ${page.url()}`);
    });
  }
  page.on('console', (m) => {
    // A failed resource names no URL in its text: add the location so a report says which one.
    if (m.type() === 'error') errors.push(m.location().url ? `${m.text()} (${m.location().url})` : m.text());
  });
  page.on('pageerror', (e) => errors.push(e.message));
  return { context, page, errors };
}

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/signin');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/signin') && u.pathname !== '/start', { timeout: 20_000 });
}

export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(OUTPUT, { recursive: true });
  const file = path.join(OUTPUT, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

export interface MailItem {
  id: number;
  to: string[];
  subject: string;
  text: string;
  attachments: { filename: string; contentType: string; size: number }[];
}

export async function mailTo(address: string): Promise<MailItem[]> {
  const res = await fetch(`${MAIL_URL}/messages?to=${encodeURIComponent(address)}`);
  return ((await res.json()) as { items: MailItem[] }).items;
}

/** After "Create account" without an invitation: the check-your-mail page, then the confirmation link from the mail. */
export async function finishSignUp(page: Page, email: string): Promise<void> {
  await page.waitForURL((u) => u.pathname === '/signup/check-email', { timeout: 20_000 });
  let link: string | undefined;
  for (let i = 0; i < 80 && !link; i++) {
    const mail = (await mailTo(email)).find((m) => m.subject === 'Finish creating your Tropopass account');
    link = mail ? /(https?:\/\/\S+\/api\/auth\/callback\/email\S+)/.exec(mail.text)?.[1] : undefined;
    if (!link) await new Promise((r) => setTimeout(r, 250));
  }
  if (!link) throw new Error(`no confirmation mail for ${email}`);
  await page.goto(link);
  await page.waitForURL((u) => !u.pathname.startsWith('/api/auth') && u.pathname !== '/start', { timeout: 20_000 });
}
