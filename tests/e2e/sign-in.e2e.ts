import { describe, expect, it } from 'vitest';
import { finishSignUp, newPage, screenshot, signIn, useBrowser, mailTo } from './support/browser';

const { browser } = useBrowser();

// Where each demo account lands after signing in through the form.
const LANDINGS: [string, string][] = [
  ['consultant@tropopass.test', '/workspaces'],
  ['planner@tropopass.test', '/w/skarn-polar'],
  ['analyst@tropopass.test', '/w/skarn-polar'],
  ['viewer@tropopass.test', '/w/velloway-jets'],
  ['billing@tropopass.test', '/w/skarn-polar/settings/billing'],
];

describe('sign in as each demo role', () => {
  it.each(LANDINGS)('%s lands on %s', async (email, path) => {
    const { page, context, errors } = await newPage(browser());
    await signIn(page, email);
    expect(new URL(page.url()).pathname).toBe(path);
    await page.getByRole('heading', { level: 1 }).waitFor();
    await screenshot(page, `signin-${email.split('@')[0]}`);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a wrong password says so and stays on the form', async () => {
    const { page, context } = await newPage(browser());
    await page.goto('/signin');
    await page.getByLabel('E-mail').fill('planner@tropopass.test');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('alert').filter({ hasText: 'do not match' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/signin');
    await context.close();
  });

  it('a finance admin cannot open flight pages (403 page) and the bare workspace address opens billing; a stranger workspace is 404', async () => {
    const { page, context } = await newPage(browser());
    await signIn(page, 'billing@tropopass.test');
    const flights = await page.goto('/w/skarn-polar/flights');
    expect(flights?.status()).toBe(403);
    const overview = await page.goto('/w/skarn-polar');
    expect(overview?.status()).toBe(200);
    expect(new URL(page.url()).pathname).toBe('/w/skarn-polar/settings/billing');
    const other = await page.goto('/w/velloway-jets');
    expect(other?.status()).toBe(404);
    await context.close();
  });
});

describe('sign up', () => {
  it('bad input shows field errors beside the fields', async () => {
    const { page, context, errors } = await newPage(browser());
    await page.goto('/signup');
    await page.getByLabel('Work e-mail').fill('not-an-address');
    await page.getByLabel('Password').fill('short');
    await page.getByRole('button', { name: 'Create account' }).click();
    await expect(page.locator('#name-error').textContent()).resolves.toContain('Enter your name');
    await expect(page.locator('#email-error').textContent()).resolves.toContain('valid e-mail');
    await expect(page.locator('#password-error').textContent()).resolves.toContain('10 characters');
    await screenshot(page, 'signup-field-errors');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('an address that already has an account gets the same answer as a new one, and its owner a mail', async () => {
    const { page, context } = await newPage(browser());
    await page.goto('/signup');
    await page.getByLabel('Your name').fill('Someone');
    await page.getByLabel('Work e-mail').fill('planner@tropopass.test');
    await page.getByLabel('Password').fill('long-enough-password');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL((u) => u.pathname === '/signup/check-email');
    expect(await page.locator('#email-error').count()).toBe(0);
    const mail = (await mailTo('planner@tropopass.test')).find((m) =>
      m.subject.startsWith('Someone tried to create a Tropopass account'),
    );
    expect(mail?.text).toContain('No new account was made');
    await context.close();
  });

  it('a new account with a first workspace lands in it as owner', async () => {
    const { page, context } = await newPage(browser());
    const email = `new-${Date.now()}@example.test`;
    await page.goto('/signup');
    await page.getByLabel('Your name').fill('New Planner');
    await page.getByLabel('Work e-mail').fill(email);
    await page.getByLabel('Password').fill('long-enough-password');
    await page.getByLabel('First workspace (optional)').fill('Aurora Test Air');
    await page.getByRole('button', { name: 'Create account' }).click();
    await finishSignUp(page, email);
    expect(new URL(page.url()).pathname).toBe('/w/aurora-test-air');
    await page.goto('/w/aurora-test-air/settings/members');
    const row = page.getByRole('row').filter({ hasText: email });
    await row.first().waitFor();
    await expect(row.first().getByRole('combobox').inputValue()).resolves.toBe('owner');
    await context.close();
  });
});

describe('e-mailed links', () => {
  it('password reset by e-mail: the link works once and the new password signs in', async () => {
    const { page, context } = await newPage(browser());
    const email = `reset-${Date.now()}@example.test`;
    await page.goto('/signup');
    await page.getByLabel('Your name').fill('Reset Tester');
    await page.getByLabel('Work e-mail').fill(email);
    await page.getByLabel('Password').fill('first-password-123');
    await page.getByRole('button', { name: 'Create account' }).click();
    await finishSignUp(page, email);
    expect(new URL(page.url()).pathname).toBe('/workspaces');
    await context.clearCookies();
    await page.goto('/reset');
    await page.getByLabel('E-mail').fill(email);
    await page.getByRole('button', { name: 'Send the reset link' }).click();
    await page.getByText('Check your e-mail').waitFor();
    const [mail] = await mailTo(email);
    const link = /https?:\/\/\S+\/reset\/\S+/.exec(mail.text)?.[0];
    expect(link).toBeTruthy();
    await page.goto(link!);
    await page.getByLabel('New password').fill('second-password-456');
    await page.getByLabel('Repeat it').fill('second-password-456');
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await page.waitForURL('**/signin?reset=1');
    await signIn(page, email, 'second-password-456');
    expect(new URL(page.url()).pathname).toBe('/workspaces');
    await page.goto(link!);
    await page.getByLabel('New password').fill('third-password-789');
    await page.getByLabel('Repeat it').fill('third-password-789');
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await page.getByRole('alert').filter({ hasText: 'not valid' }).waitFor();
    await context.close();
  });

  it('sign-in link by e-mail signs in once; a reused link is refused', async () => {
    const { page, context } = await newPage(browser());
    await page.goto('/signin');
    await page.getByRole('tab', { name: 'E-mail me a link' }).click();
    await page.getByLabel('E-mail').fill('viewer@tropopass.test');
    await page.getByRole('button', { name: 'Send the sign-in link' }).click();
    await page.waitForURL('**/signin/check-email');
    const [mail] = await mailTo('viewer@tropopass.test');
    const link = /https?:\/\/\S+\/api\/auth\/callback\/email\S+/.exec(mail.text)?.[0];
    expect(link).toBeTruthy();
    await page.goto(link!);
    await page.waitForURL((u) => !u.pathname.startsWith('/api/'));
    await page.goto('/start');
    expect(new URL(page.url()).pathname).toBe('/w/velloway-jets');
    await context.clearCookies();
    await page.goto(link!);
    expect(new URL(page.url()).pathname).toBe('/signin');
    expect(new URL(page.url()).searchParams.get('error')).toBe('Verification');
    await context.close();
  });
});
