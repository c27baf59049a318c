import fs from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import type { Page, Response } from 'playwright-core';
import { BASE_URL, newPage, screenshot, signIn, useBrowser } from './support/browser';

/**
 * axe-core (Deque's rule set for WCAG 2.x A/AA) on the main pages: no serious or critical violation.
 * The script is evaluated through the DevTools protocol rather than added as a <script> tag, because
 * the page's Content-Security-Policy (rightly) refuses an inline script without the nonce.
 * The same walk checks that the CSP blocks nothing the app itself needs.
 */
const require = createRequire(import.meta.url);
const AXE_SOURCE = fs.readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

async function axe(page: Page): Promise<AxeViolation[]> {
  await page.evaluate(AXE_SOURCE);
  const result = await page.evaluate(async () => {
    const w = window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } };
    return w.axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'best-practice'] } });
  });
  return result.violations;
}

const serious = (v: AxeViolation[]) => v.filter((x) => x.impact === 'serious' || x.impact === 'critical');
const describeViolations = (v: AxeViolation[]) => v.map((x) => `${x.impact} ${x.id}: ${x.help} at ${x.nodes.map((n) => n.target.join(' ')).slice(0, 3).join(', ')}`);
const cspErrors = (errors: string[]) => errors.filter((e) => /Content.Security.Policy|Refused to (load|execute|apply|connect)/i.test(e));

const { browser } = useBrowser();

function expectSecurityHeaders(res: Response | null, path: string): void {
  expect(res, path).not.toBeNull();
  const h = res!.headers();
  const csp = h['content-security-policy'] ?? '';
  expect(csp, `${path} CSP`).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/);
  expect(csp).toContain("frame-ancestors 'none'");
  expect(h['x-content-type-options']).toBe('nosniff');
  expect(h['referrer-policy']).toBe('strict-origin-when-cross-origin');
}

async function scriptsCarryNonce(page: Page): Promise<void> {
  const missing = await page.evaluate(() => Array.from(document.querySelectorAll('script')).filter((s) => !s.nonce).length);
  expect(missing, 'scripts without the CSP nonce').toBe(0);
}

/** Visits one page; returns its serious findings (accessibility and CSP) so a run lists every page's at once. */
async function check(page: Page, errors: string[], path: string, name: string): Promise<string[] | 'absent'> {
  const before = errors.length;
  const res = await page.goto(path);
  if (res?.status() === 404) return 'absent';
  expect(res?.status(), path).toBeLessThan(400);
  // Some screens poll (import progress, usage), so the network never idles: wait for the heading instead.
  await page.getByRole('heading', { level: 1 }).first().waitFor({ timeout: 10_000 });
  expectSecurityHeaders(res, path);
  await scriptsCarryNonce(page);
  const v = await axe(page);
  await screenshot(page, `a11y-${name}`);
  return [...describeViolations(serious(v)), ...cspErrors(errors.slice(before))].map((f) => `${path}: ${f}`);
}

describe('accessibility and CSP on the main pages', () => {
  it('signed-out pages: sign in, sign up, reset', async () => {
    const { page, context, errors } = await newPage(browser());
    const findings: string[] = [];
    for (const [path, name] of [['/signin', 'signin'], ['/signup', 'signup'], ['/reset', 'reset'], ['/', 'home']] as const) {
      const r = await check(page, errors, path, name);
      expect(r, path).not.toBe('absent');
      if (r !== 'absent') findings.push(...r);
    }
    expect(findings).toEqual([]);
    // Field errors shown: still no serious violation.
    await page.goto('/signup');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.locator('#email-error').waitFor();
    expect(describeViolations(serious(await axe(page)))).toEqual([]);
    expect(cspErrors(errors)).toEqual([]);
    await context.close();
  });

  it('signed-in pages of an owner, at desktop and tablet width', async () => {
    for (const viewport of [{ width: 1280, height: 900 }, { width: 820, height: 1180 }]) {
      const { page, context, errors } = await newPage(browser(), viewport);
      await signIn(page, 'consultant@tropopass.test');
      const slug = 'skarn-polar';
      const created = await page.request.post(`${BASE_URL}/api/v1/workspaces/${slug}/screenings`, {
        data: { name: 'Accessibility check', route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] }, cruise: { flightLevel: 370 }, fuelBurnKg: 50_000, emission: { eiNoxGPerKg: 14 }, month: 1 },
      });
      const screeningId = created.ok() ? ((await created.json()) as { id: number }).id : null;
      const pages: [string, string][] = [
        ['/workspaces', 'workspaces'],
        [`/w/${slug}`, 'overview'],
        [`/w/${slug}/settings/members`, 'members'],
        [`/w/${slug}/settings/api-keys`, 'api-keys'],
        [`/w/${slug}/settings/billing`, 'billing'],
        [`/w/${slug}/screen`, 'screen'],
        [`/w/${slug}/screenings`, 'screenings'],
        ...(screeningId ? ([[`/w/${slug}/screenings/${screeningId}`, 'screening-result']] as [string, string][]) : []),
        [`/w/${slug}/imports`, 'imports'],
        [`/w/${slug}/flights`, 'flights'],
        [`/w/${slug}/fleets`, 'fleets'],
        [`/w/${slug}/reports`, 'reports'],
        [`/w/${slug}/engines`, 'engines'],
        [`/w/${slug}/routes`, 'routes'],
        [`/w/${slug}/soundings`, 'soundings'],
        [`/w/${slug}/settings/audit`, 'audit'],
        ['/account', 'account'],
      ];
      const absent: string[] = [];
      const findings: string[] = [];
      for (const [path, name] of pages) {
        const r = await check(page, errors, path, `${name}-${viewport.width}`);
        if (r === 'absent') absent.push(path);
        else findings.push(...r);
      }
      if (absent.length) console.warn(`[a11y] not built yet, skipped: ${absent.join(', ')}`);
      expect(absent).not.toContain(`/w/${slug}`);
      expect(findings, `at ${viewport.width} px`).toEqual([]);
      await context.close();
    }
  });

  it('signed-in pages are not stored by the browser (Cache-Control: no-store)', async () => {
    const { page, context } = await newPage(browser());
    await signIn(page, 'planner@tropopass.test');
    const res = await page.goto('/w/skarn-polar');
    expect(res?.headers()['cache-control']).toContain('no-store');
    const api = await page.request.get(`${BASE_URL}/api/v1/workspaces`);
    expect(api.headers()['cache-control']).toContain('no-store');
    // next-auth's session cookie: HttpOnly, SameSite=Lax; Secure only when the app URL is https (here it is http).
    const session = (await context.cookies()).find((c) => c.name.endsWith('next-auth.session-token'));
    expect(session).toMatchObject({ httpOnly: true, sameSite: 'Lax', secure: BASE_URL.startsWith('https:') });
    await context.close();
  });
});
