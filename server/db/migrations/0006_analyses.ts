import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/** Saved analyses: parameters, the data freeze (hash and inputs snapshot), results, who and when. */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('analyses')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('parameters', 'text', (c) => c.notNull())
    .addColumn('freeze_hash', 'text', (c) => c.notNull())
    .addColumn('inputs', 'text', (c) => c.notNull())
    .addColumn('results', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('error', 'text')
    .addColumn('created_by', 'text', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('finished_at', 'text')
    .execute();
  await sql`create index analyses_project on analyses (project_id, created_at desc, id desc)`.execute(
    db,
  );
}

/** Drops what this migration added. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('analyses').ifExists().execute();
}
