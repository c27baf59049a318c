import type { Knex } from 'knex';
import { todayIso } from '../lib/clock';
import { periodContaining } from '../lib/periods/calendar';

/**
 * Two targets for the polar demo workspace's current quarter, so the periods pages are not empty:
 * NOx above the tropopause with room to spare, and a share above that the running figure has
 * passed 90 % of (its 90 % alert marked sent, so the demo sends no mail for it). Set from the seeded
 * flights, so deterministic for a given DEMO_TODAY. Idempotent.
 */
const STAMP = '2026-01-01T00:00:00.000Z';

export async function seed(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    const ws = await trx('workspaces').where({ slug: 'skarn-polar' }).first();
    if (!ws) return;
    const workspace_id = Number(ws.id);
    const q = periodContaining('quarter', todayIso());
    const sums = (await trx('flights')
      .where({ workspace_id, status: 'screened' })
      .whereBetween('date', [q.from, q.to])
      .sum({ above: 'nox_above_kg', total: 'nox_total_kg' })
      .first()) as { above: number | string | null; total: number | string | null } | undefined;
    const above = Number(sums?.above ?? 0);
    const total = Number(sums?.total ?? 0);
    if (above <= 0 || total <= 0) return;

    let period = await trx('reporting_periods').where({ workspace_id, key: q.ref }).first();
    if (!period) {
      await trx('reporting_periods').insert({
        workspace_id,
        kind: q.kind,
        key: q.ref,
        name: q.name,
        date_from: q.from,
        date_to: q.to,
        state: 'open',
        created_at: STAMP,
        updated_at: STAMP,
      });
      period = await trx('reporting_periods').where({ workspace_id, key: q.ref }).first();
    }
    const period_id = Number(period.id);
    const targets = [
      { metric: 'noxAboveT', value: Math.ceil((above / 1000) * 1.6), alert_90_at: null },
      { metric: 'shareAbovePct', value: Math.round(((100 * above) / total / 0.95) * 10) / 10, alert_90_at: STAMP },
    ];
    for (const t of targets) {
      const exists = await trx('period_targets').where({ period_id, fleet_key: 0, metric: t.metric }).first();
      if (exists) continue;
      await trx('period_targets').insert({
        workspace_id,
        period_id,
        fleet_id: null,
        fleet_key: 0,
        metric: t.metric,
        value: t.value,
        alert_90_at: t.alert_90_at,
        updated_at: STAMP,
      });
    }
  });
}
