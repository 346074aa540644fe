import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/** Identity changes (merge, split, dispute resolution, undo), dismissed duplicate pairs, digests. */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('identity_changes')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('by', 'text')
    .addColumn('at', 'text', (c) => c.notNull())
    .addColumn('reason', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('individuals', 'text', (c) => c.notNull())
    .addColumn('payload', 'text', (c) => c.notNull())
    .addColumn('undoes', 'text')
    .addColumn('undone_by', 'text')
    .execute();
  await sql`create index identity_changes_project on identity_changes (project_id, at desc, id desc)`.execute(
    db,
  );

  await db.schema
    .createTable('duplicate_dismissals')
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('first_id', 'text', (c) => c.notNull())
    .addColumn('second_id', 'text', (c) => c.notNull())
    .addColumn('by', 'text')
    .addColumn('at', 'text', (c) => c.notNull())
    .addColumn('reason', 'text', (c) => c.notNull().defaultTo(''))
    .addPrimaryKeyConstraint('duplicate_dismissals_pk', ['project_id', 'first_id', 'second_id'])
    .execute();

  await db.schema.alterTable('projects').addColumn('last_digest_at', 'text').execute();
}

/** Drops what this migration added. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('projects').dropColumn('last_digest_at').execute();
  await db.schema.dropTable('duplicate_dismissals').ifExists().execute();
  await db.schema.dropTable('identity_changes').ifExists().execute();
}
