import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { checkTargetAlerts } from '@/lib/periods/alerts';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from '../imports/support';
import { ROUTES, getView, post, putTargets } from './support';

const mailEnv: Record<string, string> = {};
let fake: SmtpFake;
beforeAll(async () => {
  fake = await startSmtpFake({ smtpPort: 0, httpPort: 0 });
  mailEnv.SMTP_PORT = String(fake.smtpPort);
});
afterAll(async () => {
  await fake?.close();
});
useTestDatabase(mailEnv);

async function importRows(slug: string, userId: number, rows: string[], fileName: string): Promise<void> {
  const r = await call(
    importsRoute.POST,
    uploadRequest(slug, csv(HEADER, ...rows), { cookie: await sessionCookie(userId), fileName }),
    { slug },
  );
  expect(r.status).toBe(202);
  await runImportsToCompletion();
}

async function waitFor(ok: () => boolean, ms = 3000): Promise<void> {
  const until = Date.now() + ms;
  while (!ok()) {
    if (Date.now() > until) throw new Error('timed out waiting for the mail');
    await new Promise((r) => setTimeout(r, 20));
  }
}

const settle = () => new Promise((r) => setTimeout(r, 300));

describe('target alerts', () => {
  it('e-mail the analysts once at 90 % and once at 100 % of a target as the running figure grows', async () => {
    const ws = await makeWorkspace(['analyst', 'planner']);
    await addScheduleLibrary(ws.id);
    const { analyst, planner } = ws.members;
    await importRows(ws.slug, analyst.id, goodRows(4, 'AL'), 'first.csv');
    const view = await getView(ws.slug, '2026-11', analyst.id);
    const tonnes = view.body.figures.total.noxAboveKg / 1000;
    expect(tonnes).toBeGreaterThan(0);

    const mails = () => fake.messages().filter((m) => /at (90|100) % of a target/.test(m.subject));
    // The figure is 95 % of this target: setting it sends the 90 % alert at once, and only that.
    const set = await putTargets(ws.slug, '2026-11', analyst.id, [
      { fleetId: null, metric: 'noxAboveT', value: tonnes / 0.95 },
    ]);
    expect(set.status, JSON.stringify(set.body)).toBe(200);
    await waitFor(() => mails().length === 1);
    expect(mails()[0].subject).toContain('90 %');
    expect(mails()[0].to).toEqual([analyst.email]);
    expect(await checkTargetAlerts({ workspaceId: ws.id })).toEqual([]);

    // Four more flights double the figure: the worker sends the 100 % alert once the import is done.
    await importRows(ws.slug, analyst.id, goodRows(4, 'BL'), 'second.csv');
    await waitFor(() => mails().length === 2);
    expect(mails()[1].subject).toContain('100 %');
    expect(mails()[1].text).toMatch(/running figure of an open period/);

    // Past both thresholds, more flights send nothing more.
    await importRows(ws.slug, analyst.id, goodRows(2, 'CL'), 'third.csv');
    expect(await checkTargetAlerts({ workspaceId: ws.id })).toEqual([]);
    await settle();
    expect(mails()).toHaveLength(2);
    // Only analysts receive them.
    expect(fake.messages().some((m) => m.to.includes(ws.owner.email) || m.to.includes(planner.email))).toBe(false);

    // A changed target starts again: halving it is past 100 % at once, so both thresholds go once more.
    await putTargets(ws.slug, '2026-11', analyst.id, [{ fleetId: null, metric: 'noxAboveT', value: tonnes / 2 }]);
    await waitFor(() => mails().length === 4);
    await settle();
    expect(mails()).toHaveLength(4);
  });

  it('a target of a frozen period is refused, and a fleet target needs a fleet of this workspace', async () => {
    const ws = await makeWorkspace(['analyst']);
    const other = await makeWorkspace([]);
    const lib = await addScheduleLibrary(ws.id);
    const theirs = await addScheduleLibrary(other.id);
    const bad = await putTargets(ws.slug, '2026-Q4', ws.members.analyst.id, [
      { fleetId: theirs.longHaulFleetId, metric: 'shareAbovePct', value: 40 },
    ]);
    expect(bad.status).toBe(422);
    expect((bad.body.error as { fields: { path: string }[] }).fields[0].path).toBe('targets.0.fleetId');
    const over = await putTargets(ws.slug, '2026-Q4', ws.members.analyst.id, [
      { fleetId: lib.longHaulFleetId, metric: 'shareAbovePct', value: 140 },
    ]);
    expect(over.status).toBe(422);
    const ok = await putTargets(ws.slug, '2026-Q4', ws.members.analyst.id, [
      { fleetId: lib.longHaulFleetId, metric: 'shareAbovePct', value: 40 },
    ]);
    expect(ok.status).toBe(200);
    expect((await post(ROUTES.reviewRoute.POST, ws.slug, '2026-Q4', '/review', ws.members.analyst.id)).status).toBe(
      200,
    );
    const frozen = await putTargets(ws.slug, '2026-Q4', ws.members.analyst.id, []);
    expect(frozen.status).toBe(409);
  });
});
