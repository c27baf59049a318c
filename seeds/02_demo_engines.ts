import type { Knex } from 'knex';

/**
 * Invented engines and aircraft types for the demo workspaces. The certification-style values are
 * plausible but made up: they describe no real engine. Idempotent.
 */
const STAMP = '2026-01-01T00:00:00.000Z';
const DEMO_SOURCE = 'Demo data: invented certification-style values, not a real engine.';

interface EngineSeed {
  slug: string;
  name: string;
  ff: [number, number, number, number];
  ei: [number, number, number, number];
}

const ENGINES: EngineSeed[] = [
  { slug: 'skarn-polar', name: 'TPX-71 demo turbofan', ff: [0.29, 0.93, 2.78, 3.42], ei: [5.2, 12.1, 29.6, 43.8] },
  { slug: 'skarn-polar', name: 'TPX-84 demo turbofan', ff: [0.26, 0.83, 2.46, 3.02], ei: [4.9, 11.4, 27.3, 38.9] },
  {
    slug: 'velloway-jets',
    name: 'TBJ-19 demo business-jet turbofan',
    ff: [0.062, 0.185, 0.55, 0.68],
    ei: [3.9, 8.4, 16.8, 21.7],
  },
];

const FLEETS: { slug: string; name: string; description: string }[] = [
  { slug: 'skarn-polar', name: 'Polar long-haul A', description: 'SK-LR1 aircraft on transpolar routes' },
  { slug: 'skarn-polar', name: 'Polar long-haul B', description: 'SK-LR2 aircraft on transpolar routes' },
  { slug: 'velloway-jets', name: 'Business jets', description: 'VJ-50 fleet at FL430-FL510' },
  { slug: 'kestrel-mach', name: 'Supersonic study', description: 'KM-SST concept at FL550-FL600' },
];

const TYPES = [
  {
    slug: 'skarn-polar',
    code: 'SK-LR1',
    name: 'Skarn long-range twin (demo)',
    engine: 'TPX-71 demo turbofan',
    count: 2,
    mach: 0.85,
    fl: 370,
    fleet: 'Polar long-haul A',
    ei: null,
  },
  {
    slug: 'skarn-polar',
    code: 'SK-LR2',
    name: 'Skarn long-range twin, stretched (demo)',
    engine: 'TPX-84 demo turbofan',
    count: 2,
    mach: 0.84,
    fl: 390,
    fleet: 'Polar long-haul B',
    ei: null,
  },
  {
    slug: 'velloway-jets',
    code: 'VJ-50',
    name: 'Velloway large-cabin business jet (demo)',
    engine: 'TBJ-19 demo business-jet turbofan',
    count: 2,
    mach: 0.85,
    fl: 470,
    fleet: 'Business jets',
    ei: null,
  },
  {
    slug: 'kestrel-mach',
    code: 'KM-SST',
    name: 'Kestrel supersonic concept (demo)',
    engine: null,
    count: 4,
    mach: 1.7,
    fl: 580,
    fleet: 'Supersonic study',
    ei: 11.5,
  },
];

export async function seed(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    const wsId = async (slug: string): Promise<number> => Number((await trx('workspaces').where({ slug }).first()).id);
    for (const e of ENGINES) {
      const workspace_id = await wsId(e.slug);
      const row = {
        workspace_id,
        name: e.name,
        ff_idle_kg_s: e.ff[0],
        ff_approach_kg_s: e.ff[1],
        ff_climb_out_kg_s: e.ff[2],
        ff_take_off_kg_s: e.ff[3],
        ei_idle_g_kg: e.ei[0],
        ei_approach_g_kg: e.ei[1],
        ei_climb_out_g_kg: e.ei[2],
        ei_take_off_g_kg: e.ei[3],
        source: DEMO_SOURCE,
        is_demo: true,
        created_at: STAMP,
        updated_at: STAMP,
      };
      const existing = await trx('engines').where({ workspace_id, name: e.name }).first();
      if (existing) await trx('engines').where({ id: existing.id }).update(row);
      else await trx('engines').insert(row);
    }
    for (const f of FLEETS) {
      const workspace_id = await wsId(f.slug);
      if (!(await trx('fleets').where({ workspace_id, name: f.name }).first())) {
        await trx('fleets').insert({ workspace_id, name: f.name, description: f.description, created_at: STAMP });
      }
    }
    for (const t of TYPES) {
      const workspace_id = await wsId(t.slug);
      const engine = t.engine ? await trx('engines').where({ workspace_id, name: t.engine }).first() : null;
      const fleet = await trx('fleets').where({ workspace_id, name: t.fleet }).first();
      const row = {
        workspace_id,
        code: t.code,
        name: t.name,
        engine_id: engine ? engine.id : null,
        engine_count: t.count,
        typical_mach: t.mach,
        typical_flight_level: t.fl,
        direct_ei_g_kg: t.ei,
        default_fleet_id: fleet.id,
        created_at: STAMP,
        updated_at: STAMP,
      };
      const existing = await trx('aircraft_types').where({ workspace_id, code: t.code }).first();
      if (existing) await trx('aircraft_types').where({ id: existing.id }).update(row);
      else await trx('aircraft_types').insert(row);
    }
  });
}
