import { Migrator, type Migration, type MigrationProvider } from 'kysely';
import type { Db } from './database';
import * as m0001 from './migrations/0001_foundation';
import * as m0002 from './migrations/0002_ingest';
import * as m0003 from './migrations/0003_sort';
import * as m0004 from './migrations/0004_identify';
import * as m0005 from './migrations/0005_curate';
import * as m0006 from './migrations/0006_analyses';
import * as m0007 from './migrations/0007_exports';
import * as m0008 from './migrations/0008_sort_queue';
import * as m0009 from './migrations/0009_identify_queue';
import * as m0010 from './migrations/0010_pattern';
import * as m0011 from './migrations/0011_pattern_jobs';

/** Migrations in order; imported statically so they work the same under tsx, tests and builds. */
const MIGRATIONS: Record<string, Migration> = {
  '0001_foundation': m0001,
  '0002_ingest': m0002,
  '0003_sort': m0003,
  '0004_identify': m0004,
  '0005_curate': m0005,
  '0006_analyses': m0006,
  '0007_exports': m0007,
  '0008_sort_queue': m0008,
  '0009_identify_queue': m0009,
  '0010_pattern': m0010,
  '0011_pattern_jobs': m0011,
};

class StaticProvider implements MigrationProvider {
  async getMigrations(): Promise<Record<string, Migration>> {
    return MIGRATIONS;
  }
}

/** Brings the database schema to the latest version; throws on the first failure. */
export async function migrateToLatest(db: Db): Promise<string[]> {
  const migrator = new Migrator({ db, provider: new StaticProvider() });
  const { error, results } = await migrator.migrateToLatest();
  if (error) throw error instanceof Error ? error : new Error(String(error));
  return (results ?? []).filter((r) => r.status === 'Success').map((r) => r.migrationName);
}
