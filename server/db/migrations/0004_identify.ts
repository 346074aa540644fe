import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/** Individuals, reference photos, aliases, reviewers' calls, and leases on sightings. */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('individuals')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('code', 'text')
    .addColumn('nickname', 'text')
    .addColumn('sex', 'text', (c) => c.notNull().defaultTo('unknown'))
    .addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('tags', 'text', (c) => c.notNull().defaultTo('[]'))
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('merged_into', 'text')
    .addColumn('created_by', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await sql`create unique index individuals_project_code on individuals (project_id, code) where code is not null`.execute(
    db,
  );
  await db.schema
    .createIndex('individuals_project_status')
    .on('individuals')
    .columns(['project_id', 'status'])
    .execute();

  await db.schema
    .createTable('reference_photos')
    .addColumn('individual_id', 'text', (c) =>
      c.notNull().references('individuals.id').onDelete('cascade'),
    )
    .addColumn('flank', 'text', (c) => c.notNull())
    .addColumn('photo_id', 'text', (c) => c.notNull().references('photos.id'))
    .addColumn('position', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('chosen_by', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addPrimaryKeyConstraint('reference_photos_pk', ['individual_id', 'flank', 'photo_id'])
    .execute();

  await db.schema
    .createTable('aliases')
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('code', 'text', (c) => c.notNull())
    .addColumn('individual_id', 'text', (c) =>
      c.notNull().references('individuals.id').onDelete('cascade'),
    )
    .addColumn('change_id', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addPrimaryKeyConstraint('aliases_pk', ['project_id', 'code'])
    .execute();

  await db.schema
    .createTable('calls')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('sighting_id', 'text', (c) =>
      c.notNull().references('sightings.id').onDelete('cascade'),
    )
    .addColumn('reviewer_id', 'text', (c) => c.notNull().references('users.id'))
    .addColumn('verdict', 'text', (c) => c.notNull())
    .addColumn('individual_id', 'text')
    .addColumn('note', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addUniqueConstraint('calls_sighting_reviewer', ['sighting_id', 'reviewer_id'])
    .execute();
  await db.schema.createIndex('calls_individual').on('calls').column('individual_id').execute();

  await db.schema.alterTable('sightings').addColumn('lease_holder', 'text').execute();
  await db.schema.alterTable('sightings').addColumn('lease_until', 'text').execute();
}

/** Drops what this migration added. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('sightings').dropColumn('lease_until').execute();
  await db.schema.alterTable('sightings').dropColumn('lease_holder').execute();
  for (const t of ['calls', 'aliases', 'reference_photos', 'individuals'])
    await db.schema.dropTable(t).ifExists().execute();
}
