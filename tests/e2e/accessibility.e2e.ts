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

/**
 * Serious findings already reported to the owners of those screens, by page and axe rule. Each is
 * printed on every run; any other serious or critical finding fails. Remove a line once it is fixed.
 */
const REPORTED: Record<string, string> = {
};

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

/** Every script in the server's HTML carries the response's nonce (scripts those load later are trusted through 'strict-dynamic'). */
async function scriptsCarryNonce(res: Response, path: string): Promise<void> {
  const nonce = /'nonce-([^']+)'/.exec(res.headers()['content-security-policy'] ?? '')?.[1];
  const html = await res.text();
  const tags = html.match(/<script\b[^>]*>/g) ?? [];
  expect(tags.length, `${path}: scripts in the HTML`).toBeGreaterThan(0);
  expect(tags.filter((t) => !t.includes(`nonce="${nonce}"`)), `${path}: scripts without this response's nonce`).toEqual([]);
}

/**
 * Visits one page; returns its serious findings (accessibility and CSP) so a run lists every page's at
 * once. A page that does not answer 2xx (a 404 included) fails here: every page listed must exist.
 */
async function check(page: Page, errors: string[], path: string, name: string): Promise<string[]> {
  const before = errors.length;
  const res = await page.goto(path);
  expect(res?.status(), path).toBeLessThan(300);
  // Some screens poll (import progress, usage), so the network never idles: wait for the heading instead.
  await page.getByRole('heading', { level: 1 }).first().waitFor({ timeout: 10_000 });
  expectSecurityHeaders(res, path);
  await scriptsCarryNonce(res!, path);
  const v = await axe(page);
  await screenshot(page, `a11y-${name}`);
  const screen = name.replace(/-\d+$/, '');
  const reported = (x: AxeViolation) => REPORTED[`${screen} ${x.id}`] ?? REPORTED[`* ${x.id}`];
  const known = serious(v).filter((x) => reported(x));
  for (const k of known) console.warn(`[a11y] reported, not yet fixed: ${path} ${k.id}: ${reported(k)}`);
  const fresh = serious(v).filter((x) => !known.includes(x));
  return [...describeViolations(fresh), ...cspErrors(errors.slice(before))].map((f) => `${path}: ${f}`);
}

describe('accessibility and CSP on the main pages', () => {
  it('signed-out pages: sign in, sign up, reset', async () => {
    const { page, context, errors } = await newPage(browser());
    const findings: string[] = [];
    for (const [path, name] of [['/signin', 'signin'], ['/signup', 'signup'], ['/reset', 'reset'], ['/', 'home']] as const) {
      findings.push(...(await check(page, errors, path, name)));
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
      expect(created.status(), 'creating the screening this walk opens').toBe(201);
      const screeningId = ((await created.json()) as { id: number }).id;
      // Detail screens: the first row of each list, created here when the demo scenario holds none.
      const api = `${BASE_URL}/api/v1/workspaces/${slug}`;
      const firstIds = async (resource: string): Promise<number[]> => {
        const r = await page.request.get(`${api}/${resource}`);
        expect(r.status(), `listing ${resource}`).toBe(200);
        return (((await r.json()) as { items?: { id: number }[] }).items ?? []).map((x) => x.id);
      };
      const fleetIds = (await firstIds('fleets')).slice(0, 2);
      const blanks: Record<string, object | null> = {
        reports: { name: 'Accessibility check', from: '2026-09-01', to: '2026-11-20', fleetIds },
        routes: { name: 'Accessibility check', waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
        soundings: {
          name: 'Accessibility check',
          levels: Array.from({ length: 21 }, (_, k) => ({ altitudeM: k * 1000, temperatureK: k <= 11 ? 288.15 - 6.5 * k : 216.65 })),
        },
        engines: null,
        'aircraft-types': null,
      };
      const details: [string, string][] = [];
      for (const [resource, route, name] of [
        ['reports', 'reports', 'report'],
        ['routes', 'routes', 'route'],
        ['soundings', 'soundings', 'sounding'],
        ['engines', 'engines', 'engine'],
        ['aircraft-types', 'engines/aircraft', 'aircraft-type'],
      ] as const) {
        let id = (await firstIds(resource))[0];
        if (id === undefined) {
          const body = blanks[resource];
          expect(body, `the demo scenario holds ${resource}`).not.toBeNull();
          const made = await page.request.post(`${api}/${resource}`, { data: body });
          expect(made.status(), `creating one of ${resource}`).toBe(201);
          id = ((await made.json()) as { id: number }).id;
        }
        details.push([`/w/${slug}/${route}/${id}`, name]);
      }
      const pages: [string, string][] = [
        ['/workspaces', 'workspaces'],
        [`/w/${slug}`, 'overview'],
        [`/w/${slug}/settings/members`, 'members'],
        [`/w/${slug}/settings/api-keys`, 'api-keys'],
        [`/w/${slug}/settings/billing`, 'billing'],
        [`/w/${slug}/screen`, 'screen'],
        [`/w/${slug}/screenings`, 'screenings'],
        [`/w/${slug}/screenings/${screeningId}`, 'screening-result'],
        [`/w/${slug}/imports`, 'imports'],
        [`/w/${slug}/flights`, 'flights'],
        [`/w/${slug}/fleets`, 'fleets'],
        [`/w/${slug}/reports`, 'reports'],
        [`/w/${slug}/engines`, 'engines'],
        [`/w/${slug}/routes`, 'routes'],
        [`/w/${slug}/soundings`, 'soundings'],
        [`/w/${slug}/screenings/compare`, 'screenings-compare'],
        ...details,
        [`/w/${slug}/settings/audit`, 'audit'],
        ['/account', 'account'],
      ];
      const findings: string[] = [];
      for (const [path, name] of pages) findings.push(...(await check(page, errors, path, `${name}-${viewport.width}`)));
      expect(findings, `at ${viewport.width} px`).toEqual([]);
      await context.close();
    }
  });

  it('a finance admin and a read-only member see their own screens without serious findings', async () => {
    const findings: string[] = [];
    for (const [email, pages] of [
      ['billing@tropopass.test', [['/w/skarn-polar/settings/billing', 'billing-finance-admin']]],
      ['viewer@tropopass.test', [['/w/velloway-jets', 'overview-viewer'], ['/w/velloway-jets/screenings', 'screenings-viewer'], ['/w/velloway-jets/fleets', 'fleets-viewer']]],
    ] as const) {
      const { page, context, errors } = await newPage(browser());
      await signIn(page, email);
      for (const [path, name] of pages) {
        findings.push(...(await check(page, errors, path, name)));
      }
      await context.close();
    }
    expect(findings).toEqual([]);
  });

  it('signed-in pages are not stored by the browser (Cache-Control: no-store)', async () => {
    const { page, context } = await newPage(browser());
    await signIn(page, 'planner@tropopass.test');
    const res = await page.goto('/w/skarn-polar');
    expect(res?.headers()['cache-control']).toContain('no-store');
    const api = await page.request.get(`${BASE_URL}/api/v1/workspaces`);
    expect(api.headers()['cache-control']).toContain('no-store');
    // The JSON API skips the proxy and gets fixed headers from next.config.mjs.
    expect(api.headers()['x-content-type-options']).toBe('nosniff');
    expect(api.headers()['content-security-policy']).toBe("default-src 'none'; frame-ancestors 'none'");
    const auth = await page.request.get(`${BASE_URL}/api/auth/session`);
    expect(auth.headers()['cache-control']).toContain('no-store');
    // next-auth's session cookie: HttpOnly, SameSite=Lax; Secure only when the app URL is https (here it is http).
    const session = (await context.cookies()).find((c) => c.name.endsWith('next-auth.session-token'));
    expect(session).toMatchObject({ httpOnly: true, sameSite: 'Lax', secure: BASE_URL.startsWith('https:') });
    await context.close();
  });
});
