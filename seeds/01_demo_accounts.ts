import type { Knex } from 'knex';
import { hash } from '@node-rs/argon2';

/**
 * The invented demo scenario: a consultancy owning three client workspaces, and one
 * account per role. Idempotent: re-running leaves the same rows. Demo only.
 */
export const DEMO_PASSWORD = 'tropopass-demo';

export const DEMO_USERS = [
  { email: 'consultant@tropopass.test', name: 'Demo Consultant' },
  { email: 'planner@tropopass.test', name: 'Demo Planner' },
  { email: 'analyst@tropopass.test', name: 'Demo Analyst' },
  { email: 'viewer@tropopass.test', name: 'Demo Viewer' },
  { email: 'billing@tropopass.test', name: 'Demo Finance' },
] as const;

export const DEMO_WORKSPACES = [
  { slug: 'skarn-polar', name: 'Skarn Polar (demo)' },
  { slug: 'velloway-jets', name: 'Velloway Jets (demo)' },
  { slug: 'kestrel-mach', name: 'Kestrel Mach (demo)' },
] as const;

const MEMBERS: [string, string, string][] = [
  ['consultant@tropopass.test', 'skarn-polar', 'owner'],
  ['consultant@tropopass.test', 'velloway-jets', 'owner'],
  ['consultant@tropopass.test', 'kestrel-mach', 'owner'],
  ['planner@tropopass.test', 'skarn-polar', 'planner'],
  ['analyst@tropopass.test', 'skarn-polar', 'analyst'],
  ['viewer@tropopass.test', 'velloway-jets', 'viewer'],
  ['billing@tropopass.test', 'skarn-polar', 'billing'],
];

const STAMP = '2026-01-01T00:00:00.000Z';

export async function seed(knex: Knex): Promise<void> {
  const passwordHash = await hash(DEMO_PASSWORD);
  await knex.transaction(async (trx) => {
    for (const u of DEMO_USERS) {
      const existing = await trx('users').where({ email: u.email }).first();
      if (existing) {
        await trx('users').where({ id: existing.id }).update({ name: u.name, password_hash: passwordHash });
      } else {
        await trx('users').insert({
          ...u,
          password_hash: passwordHash,
          email_verified_at: STAMP,
          created_at: STAMP,
          updated_at: STAMP,
        });
      }
    }
    const owner = await trx('users').where({ email: 'consultant@tropopass.test' }).first();
    for (const w of DEMO_WORKSPACES) {
      if (!(await trx('workspaces').where({ slug: w.slug }).first())) {
        await trx('workspaces').insert({ ...w, created_by: owner.id, created_at: STAMP });
      }
    }
    for (const [email, slug, role] of MEMBERS) {
      const u = await trx('users').where({ email }).first();
      const w = await trx('workspaces').where({ slug }).first();
      const m = await trx('memberships').where({ workspace_id: w.id, user_id: u.id }).first();
      if (m) await trx('memberships').where({ id: m.id }).update({ role });
      else await trx('memberships').insert({ workspace_id: w.id, user_id: u.id, role, created_at: STAMP });
    }
  });
}
