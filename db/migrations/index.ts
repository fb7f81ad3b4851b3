import type { Knex } from 'knex';
import * as m0001 from './0001_accounts';
import * as m0002 from './0002_fleet';
import * as m0003 from './0003_cases';
import * as m0006 from './0006_mail_sink';
import * as m0007 from './0007_monte_carlo_runs';
import * as m0008 from './0008_reset_requests';
import * as m0009 from './0009_submitted_case';
import * as m0011 from './0011_mail_outbox';
import * as m0012 from './0012_auth_guard';
import * as m0013 from './0013_valuation_fields';
import * as m0014 from './0014_pinned_run';
import * as m0015 from './0015_frozen_proposal';
import * as m0016 from './0016_membership_version';
import * as m0017 from './0017_readings';
import * as m0018 from './0018_case_truck_figures';
import * as m0019 from './0019_case_engine_lives';
import * as m0020 from './0020_run_claims';

/**
 * Migrations are listed here in order, so they load the same way under Next,
 * tsx scripts and vitest (no file-system scan, no TypeScript loader needed).
 * To add one: create `NNNN_name.ts` exporting `up` and `down`, then append it below.
 */
const migrations: Record<string, { up: (k: Knex) => Promise<void>; down: (k: Knex) => Promise<void>; config?: { transaction?: boolean } }> = {
  '0001_accounts': m0001,
  '0002_fleet': m0002,
  '0003_cases': m0003,
  '0006_mail_sink': m0006,
  '0007_monte_carlo_runs': m0007,
  '0008_reset_requests': m0008,
  '0009_submitted_case': m0009,
  '0011_mail_outbox': m0011,
  '0012_auth_guard': m0012,
  '0013_valuation_fields': m0013,
  '0014_pinned_run': m0014,
  '0015_frozen_proposal': m0015,
  '0016_membership_version': m0016,
  '0017_readings': m0017,
  '0018_case_truck_figures': m0018,
  '0019_case_engine_lives': m0019,
  '0020_run_claims': m0020,
};

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => Object.keys(migrations),
  getMigrationName: (name) => name,
  getMigration: async (name) => migrations[name],
};
