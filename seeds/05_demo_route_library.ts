import type { Knex } from 'knex';

/**
 * An invented fix and airway library for the polar demo workspace: named points over the North
 * Atlantic and the Arctic and two airways through them. The names and positions are made up for the
 * demo and are not a navigation database (the airway letter X is not an ICAO route designator).
 * One name is used twice, in two regions, to show how a flight plan picks the nearer one. Idempotent.
 */
const STAMP = '2026-01-01T00:00:00.000Z';

const FIXES: { name: string; region: string; lat: number; lon: number }[] = [
  // North Atlantic chain, east to west.
  { name: 'QXARN', region: '', lat: 61, lon: -10 },
  { name: 'QXBEL', region: '', lat: 62, lon: -20 },
  { name: 'QXCOR', region: '', lat: 63, lon: -30 },
  { name: 'QXDUN', region: '', lat: 63, lon: -40 },
  { name: 'QXELM', region: 'north atlantic', lat: 62, lon: -50 },
  // Arctic chain, from the Norwegian Sea over northern Greenland to the Beaufort Sea.
  { name: 'QXFRO', region: '', lat: 70, lon: 0 },
  { name: 'QXGLA', region: '', lat: 75, lon: -20 },
  { name: 'QXHAV', region: '', lat: 78, lon: -40 },
  { name: 'QXIKE', region: '', lat: 79, lon: -60 },
  { name: 'QXJOR', region: '', lat: 78, lon: -80 },
  { name: 'QXKAL', region: '', lat: 75, lon: -100 },
  { name: 'QXELM', region: 'arctic', lat: 70, lon: -115 },
  { name: 'QXPOL', region: '', lat: 85, lon: 0 },
];

const AIRWAYS: { name: string; fixes: string[] }[] = [
  { name: 'XN1', fixes: ['QXARN', 'QXBEL', 'QXCOR', 'QXDUN', 'QXELM'] },
  { name: 'XA2', fixes: ['QXFRO', 'QXGLA', 'QXHAV', 'QXIKE', 'QXJOR', 'QXKAL', 'QXELM'] },
];

export async function seed(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    const ws = await trx('workspaces').where({ slug: 'skarn-polar' }).first();
    if (!ws) return;
    const workspace_id = Number(ws.id);
    for (const f of FIXES) {
      const existing = await trx('fixes').where({ workspace_id, name: f.name, region: f.region }).first();
      if (existing) await trx('fixes').where({ id: existing.id }).update({ lat: f.lat, lon: f.lon });
      else await trx('fixes').insert({ workspace_id, ...f, created_at: STAMP });
    }
    for (const a of AIRWAYS) {
      const existing = await trx('airways').where({ workspace_id, name: a.name }).first();
      let id: number;
      if (existing) {
        id = Number(existing.id);
        await trx('airway_fixes').where({ airway_id: id }).delete();
      } else {
        const [row] = await trx('airways').insert({ workspace_id, name: a.name, created_at: STAMP }).returning('id');
        id = Number(typeof row === 'object' ? row.id : row);
      }
      await trx('airway_fixes').insert(a.fixes.map((fix_name, i) => ({ airway_id: id, sequence: i + 1, fix_name })));
    }
  });
}
