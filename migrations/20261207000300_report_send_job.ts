import type { Knex } from 'knex';

/**
 * A queued report e-mail keeps what its job needs beyond the send itself (sender name, note, actor)
 * as JSON, so a send recorded by a process that died before it could queue the job is queued again
 * by the sweep (lib/reports/jobs.ts). Null for sends recorded before this column existed.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('report_sends', (t) => {
    t.text('job_json').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('report_sends', (t) => {
    t.dropColumn('job_json');
  });
}
