import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/** Event labels with leases, the project's species list, sightings, and human-photo retention. */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('events').addColumn('label', 'text').execute();
  await db.schema.alterTable('events').addColumn('species', 'text').execute();
  await db.schema.alterTable('events').addColumn('animal_count', 'integer').execute();
  await db.schema.alterTable('events').addColumn('sorted_by', 'text').execute();
  await db.schema.alterTable('events').addColumn('sorted_at', 'text').execute();
  await db.schema
    .alterTable('events')
    .addColumn('label_version', 'integer', (c) => c.notNull().defaultTo(0))
    .execute();
  await db.schema.alterTable('events').addColumn('lease_holder', 'text').execute();
  await db.schema.alterTable('events').addColumn('lease_until', 'text').execute();
  await sql`create index events_queue on events (project_id, label, start, id)`.execute(db);

  await db.schema.alterTable('projects').addColumn('human_retention_days', 'integer').execute();

  await db.schema
    .createTable('project_species')
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('scientific_name', 'text', (c) => c.notNull())
    .addColumn('common_name', 'text', (c) => c.notNull())
    .addColumn('position', 'integer', (c) => c.notNull())
    .addPrimaryKeyConstraint('project_species_pk', ['project_id', 'scientific_name'])
    .execute();

  await db.schema
    .createTable('sightings')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('event_id', 'text', (c) => c.notNull().references('events.id').onDelete('cascade'))
    .addColumn('flank', 'text', (c) => c.notNull())
    .addColumn('quality', 'text', (c) => c.notNull())
    .addColumn('best_photo_id', 'text', (c) => c.notNull().references('photos.id'))
    .addColumn('crop', 'text')
    .addColumn('sex', 'text')
    .addColumn('age_class', 'text')
    .addColumn('state', 'text', (c) => c.notNull().defaultTo('open'))
    .addColumn('individual_id', 'text')
    .addColumn('created_by', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await sql`create index sightings_project_state on sightings (project_id, state, created_at, id)`.execute(
    db,
  );
  await db.schema.createIndex('sightings_event').on('sightings').column('event_id').execute();
  await db.schema
    .createIndex('sightings_individual')
    .on('sightings')
    .column('individual_id')
    .execute();
}

/** Drops what this migration added. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('sightings').ifExists().execute();
  await db.schema.dropTable('project_species').ifExists().execute();
  await sql`drop index if exists events_queue`.execute(db);
  for (const c of [
    'lease_until',
    'lease_holder',
    'label_version',
    'sorted_at',
    'sorted_by',
    'animal_count',
    'species',
    'label',
  ]) {
    await db.schema.alterTable('events').dropColumn(c).execute();
  }
  await db.schema.alterTable('projects').dropColumn('human_retention_days').execute();
}
