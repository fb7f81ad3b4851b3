// Knex configuration for tools that look for a knexfile; the app, scripts and tests
// share the same settings through lib/db/config.ts.
import { knexConfig } from './lib/db/config';

const config = knexConfig();
export default config;
