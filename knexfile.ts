/**
 * Configuration for the knex CLI (`npm run migrate`, run under tsx). The built server uses the same
 * settings with a bundled migration source whose names match these files.
 */
import type { Knex } from 'knex';
import { knexConfig } from './src/lib/server/db/config';

const config: Knex.Config = {
  ...knexConfig(),
  migrations: { directory: './migrations', extension: 'ts', loadExtensions: ['.ts'] },
};

export default config;
