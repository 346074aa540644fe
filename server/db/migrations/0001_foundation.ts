import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/** Accounts, sessions, projects, memberships, invitations, resets, audit log, mail outbox. */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('users')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('email', 'text', (c) => c.notNull().unique())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('password_hash', 'text')
    .addColumn('is_admin', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('disabled', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('last_login_at', 'text')
    .execute();

  await db.schema
    .createTable('sessions')
    .addColumn('sid', 'text', (c) => c.primaryKey())
    .addColumn('user_id', 'text')
    .addColumn('sess', 'text', (c) => c.notNull())
    .addColumn('expires_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('sessions_expires').on('sessions').column('expires_at').execute();
  await db.schema.createIndex('sessions_user').on('sessions').column('user_id').execute();

  await db.schema
    .createTable('projects')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('slug', 'text', (c) => c.notNull().unique())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('description', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('target_species_scientific', 'text', (c) => c.notNull())
    .addColumn('target_species_common', 'text', (c) => c.notNull())
    .addColumn('timezone', 'text', (c) => c.notNull().defaultTo('UTC'))
    .addColumn('independence_minutes', 'integer', (c) => c.notNull().defaultTo(30))
    .addColumn('occasion_hours', 'integer', (c) => c.notNull().defaultTo(24))
    .addColumn('reviewers_per_sighting', 'integer', (c) => c.notNull().defaultTo(2))
    .addColumn('sensitivity', 'text', (c) => c.notNull().defaultTo('medium'))
    .addColumn('sensitivity_review_date', 'text')
    .addColumn('code_prefix', 'text', (c) => c.notNull())
    .addColumn('code_next', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('created_by', 'text', (c) => c.references('users.id').onDelete('set null'))
    .execute();

  await db.schema
    .createTable('memberships')
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('user_id', 'text', (c) => c.notNull().references('users.id').onDelete('cascade'))
    .addColumn('role', 'text', (c) => c.notNull())
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addPrimaryKeyConstraint('memberships_pk', ['project_id', 'user_id'])
    .execute();
  await db.schema.createIndex('memberships_user').on('memberships').column('user_id').execute();

  await db.schema
    .createTable('invitations')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('role', 'text', (c) => c.notNull())
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('invited_by', 'text', (c) => c.notNull().references('users.id'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('expires_at', 'text', (c) => c.notNull())
    .addColumn('accepted_at', 'text')
    .addColumn('accepted_by', 'text', (c) => c.references('users.id'))
    .execute();

  await db.schema
    .createTable('password_resets')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('user_id', 'text', (c) => c.notNull().references('users.id').onDelete('cascade'))
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('expires_at', 'text', (c) => c.notNull())
    .addColumn('used_at', 'text')
    .execute();

  await db.schema
    .createTable('audit_log')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('at', 'text', (c) => c.notNull())
    .addColumn('user_id', 'text')
    .addColumn('project_id', 'text')
    .addColumn('action', 'text', (c) => c.notNull())
    .addColumn('entity', 'text', (c) => c.notNull())
    .addColumn('entity_id', 'text')
    .addColumn('before', 'text')
    .addColumn('after', 'text')
    .execute();
  await db.schema
    .createIndex('audit_log_entity')
    .on('audit_log')
    .columns(['entity', 'entity_id', 'at'])
    .execute();
  await db.schema
    .createIndex('audit_log_project')
    .on('audit_log')
    .columns(['project_id', 'at'])
    .execute();

  await db.schema
    .createTable('mail_messages')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('message_id', 'text')
    .addColumn('to_addr', 'text', (c) => c.notNull())
    .addColumn('from_addr', 'text', (c) => c.notNull())
    .addColumn('subject', 'text', (c) => c.notNull())
    .addColumn('text', 'text', (c) => c.notNull())
    .addColumn('html', 'text')
    .addColumn('received_at', 'text', (c) => c.notNull())
    .execute();
  await sql`create index mail_messages_received on mail_messages (received_at desc, id desc)`.execute(
    db,
  );
}

/** Drops everything this migration made. */
export async function down(db: Kysely<unknown>): Promise<void> {
  for (const table of [
    'mail_messages',
    'audit_log',
    'password_resets',
    'invitations',
    'memberships',
    'projects',
    'sessions',
    'users',
  ]) {
    await db.schema.dropTable(table).ifExists().execute();
  }
}
