import type { Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/** Camera model per deployment, and review information of sightings imported from a package. */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('deployments').addColumn('camera_model', 'text').execute();
  await db.schema.alterTable('sightings').addColumn('imported_review', 'text').execute();
}

/** Drops what this migration added. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('sightings').dropColumn('imported_review').execute();
  await db.schema.alterTable('deployments').dropColumn('camera_model').execute();
}
