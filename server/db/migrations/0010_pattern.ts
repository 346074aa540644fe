import type { Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/**
 * Coat-pattern features: one row per photo and crop (a sighting's best photo with its crop box,
 * or a reference photo with the crop of the sighting it came from), with the vocabulary the
 * visual words refer to. A sighting and a reference made from the same photo and crop share
 * one row. Rows whose vocabulary is not the current one are computed again.
 */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('pattern_features')
    .addColumn('photo_id', 'text', (c) => c.notNull().references('photos.id').onDelete('cascade'))
    // The crop as the sighting stores it (JSON of fractions), '' for the whole photo.
    .addColumn('crop', 'text', (c) => c.notNull())
    .addColumn('vocabulary', 'text', (c) => c.notNull())
    .addColumn('keypoints', 'integer', (c) => c.notNull())
    .addColumn('features', 'blob', (c) => c.notNull())
    .addColumn('computed_at', 'text', (c) => c.notNull())
    .addPrimaryKeyConstraint('pattern_features_pk', ['photo_id', 'crop'])
    .execute();
  // Has anything been computed since? (a cheap check before the catalogue index is rebuilt)
  await db.schema
    .createIndex('pattern_features_computed')
    .on('pattern_features')
    .column('computed_at')
    .execute();
  // A reference photo's crop is the crop of the sighting that chose it as best photo.
  await db.schema
    .createIndex('sightings_best_photo')
    .on('sightings')
    .column('best_photo_id')
    .execute();
}

/** Drops the table and the index. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropIndex('sightings_best_photo').ifExists().execute();
  await db.schema.dropTable('pattern_features').ifExists().execute();
}
