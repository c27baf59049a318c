import type { Knex } from 'knex';
import { knexConfig } from './db/config';

const config: Record<string, Knex.Config> = {
  development: knexConfig(),
  test: knexConfig(),
  production: knexConfig(),
};

export default config;
