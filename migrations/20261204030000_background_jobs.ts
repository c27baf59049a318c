import type { Knex } from 'knex';

/**
 * Background jobs. `local_jobs` is the queue of the in-process runner (the SQLite default; on
 * PostgreSQL the jobs live in pg-boss's own schema and this table stays empty). `job_failures` holds
 * the jobs that used up their attempts (dead letters) on both databases, so an owner can see them
 * with their reason and queue them again.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('local_jobs', (t) => {
    t.increments('id').primary();
    t.string('name', 100).notNullable();
    t.text('payload_json').notNullable();
    t.string('singleton_key', 200).nullable();
    t.string('state', 16).notNullable().defaultTo('queued');
    t.integer('attempts').notNullable().defaultTo(0);
    t.integer('max_attempts').notNullable();
    t.string('run_after', 32).notNullable();
    t.text('last_error').nullable();
    t.string('created_at', 32).notNullable();
    t.index(['state', 'run_after'], 'local_jobs_due_idx');
    t.index(['name', 'singleton_key'], 'local_jobs_singleton_idx');
  });
  await knex.schema.createTable('job_failures', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').nullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('job_name', 100).notNullable();
    t.text('payload_json').notNullable();
    t.text('reason').notNullable();
    t.integer('attempts').notNullable();
    t.string('failed_at', 32).notNullable();
    t.string('retried_at', 32).nullable();
    t.integer('retried_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.index(['workspace_id', 'failed_at'], 'job_failures_workspace_idx');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('job_failures');
  await knex.schema.dropTableIfExists('local_jobs');
}
