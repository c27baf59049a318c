import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.increments('id').primary();
    t.string('email', 254).notNullable().unique();
    t.string('name', 120).notNullable().defaultTo('');
    t.string('password_hash', 255).nullable();
    t.string('email_verified_at', 32).nullable();
    t.integer('session_version').notNullable().defaultTo(1);
    t.string('units', 16).notNullable().defaultTo('metric');
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
  });

  await knex.schema.createTable('workspaces', (t) => {
    t.increments('id').primary();
    t.string('slug', 48).notNullable().unique();
    t.string('name', 120).notNullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
  });

  await knex.schema.createTable('memberships', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.integer('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.string('role', 16).notNullable();
    t.string('created_at', 32).notNullable();
    t.unique(['workspace_id', 'user_id']);
    t.index(['user_id']);
  });

  await knex.schema.createTable('invitations', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('email', 254).notNullable();
    t.string('role', 16).notNullable();
    t.string('token_hash', 64).notNullable().unique();
    t.integer('invited_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('expires_at', 32).notNullable();
    t.string('accepted_at', 32).nullable();
    t.string('revoked_at', 32).nullable();
    t.string('created_at', 32).notNullable();
    t.index(['workspace_id', 'email']);
  });

  await knex.schema.createTable('api_keys', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('name', 80).notNullable();
    t.string('role', 16).notNullable();
    t.string('key_prefix', 16).notNullable();
    t.string('key_hash', 64).notNullable().unique();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('last_used_at', 32).nullable();
    t.string('revoked_at', 32).nullable();
    t.index(['workspace_id']);
  });

  // Sign-in links (next-auth's e-mail provider) and password resets; tokens are stored hashed.
  await knex.schema.createTable('verification_tokens', (t) => {
    t.string('identifier', 254).notNullable();
    t.string('token', 128).notNullable();
    t.string('purpose', 16).notNullable().defaultTo('signin');
    t.string('expires', 32).notNullable();
    t.primary(['identifier', 'token']);
  });

  await knex.schema.createTable('audit_log', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').nullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.integer('user_id').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('actor', 254).nullable();
    t.string('action', 64).notNullable();
    t.string('target', 254).nullable();
    t.text('detail').nullable();
    t.string('ip', 64).nullable();
    t.string('created_at', 32).notNullable();
    t.index(['workspace_id', 'created_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    'audit_log',
    'verification_tokens',
    'api_keys',
    'invitations',
    'memberships',
    'workspaces',
    'users',
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
