import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/** Stations, deployments, card uploads, photos, the durable job queue and events. */
export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('projects').addColumn('boundary_geojson', 'text').execute();
  await db.schema.alterTable('projects').addColumn('tile_url', 'text').execute();
  await db.schema
    .alterTable('projects')
    .addColumn('gps_tolerance_m', 'integer', (c) => c.notNull().defaultTo(250))
    .execute();

  await db.schema
    .createTable('stations')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('code', 'text', (c) => c.notNull())
    .addColumn('name', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('lat', 'real', (c) => c.notNull())
    .addColumn('lon', 'real', (c) => c.notNull())
    .addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addUniqueConstraint('stations_project_code', ['project_id', 'code'])
    .execute();

  await db.schema
    .createTable('deployments')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('station_id', 'text', (c) =>
      c.notNull().references('stations.id').onDelete('restrict'),
    )
    .addColumn('camera_label', 'text', (c) => c.notNull())
    .addColumn('camera_serial', 'text')
    .addColumn('start', 'text', (c) => c.notNull())
    .addColumn('end', 'text', (c) => c.notNull())
    .addColumn('timezone', 'text', (c) => c.notNull())
    .addColumn('clock_offset_seconds', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('last_working', 'text')
    .addColumn('feature_type', 'text')
    .addColumn('bait_use', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('clock_fix', 'text')
    .addColumn('created_by', 'text', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema
    .createIndex('deployments_station')
    .on('deployments')
    .columns(['station_id', 'start'])
    .execute();
  await db.schema
    .createIndex('deployments_project')
    .on('deployments')
    .columns(['project_id', 'start'])
    .execute();

  await db.schema
    .createTable('card_uploads')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('deployment_id', 'text', (c) =>
      c.notNull().references('deployments.id').onDelete('cascade'),
    )
    .addColumn('uploader_id', 'text', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('accepted', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('duplicate', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('rejected', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema
    .createIndex('card_uploads_project')
    .on('card_uploads')
    .columns(['project_id', 'created_at'])
    .execute();

  await db.schema
    .createTable('upload_files')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('upload_id', 'text', (c) =>
      c.notNull().references('card_uploads.id').onDelete('cascade'),
    )
    .addColumn('seq', 'integer', (c) => c.notNull())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('code', 'text')
    .addColumn('message', 'text')
    .addColumn('photo_id', 'text')
    .execute();
  await db.schema
    .createIndex('upload_files_upload')
    .on('upload_files')
    .columns(['upload_id', 'seq'])
    .execute();

  await db.schema
    .createTable('photos')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('deployment_id', 'text', (c) =>
      c.notNull().references('deployments.id').onDelete('cascade'),
    )
    .addColumn('upload_id', 'text', (c) =>
      c.notNull().references('card_uploads.id').onDelete('cascade'),
    )
    .addColumn('sha256', 'text', (c) => c.notNull())
    .addColumn('original_name', 'text', (c) => c.notNull())
    .addColumn('stored_path', 'text', (c) => c.notNull())
    .addColumn('bytes', 'integer', (c) => c.notNull())
    .addColumn('width', 'integer', (c) => c.notNull())
    .addColumn('height', 'integer', (c) => c.notNull())
    .addColumn('taken_at_exif', 'text')
    .addColumn('taken_at', 'text')
    .addColumn('gps_lat', 'real')
    .addColumn('gps_lon', 'real')
    .addColumn('make', 'text')
    .addColumn('model', 'text')
    .addColumn('serial', 'text')
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('error', 'text')
    .addColumn('flags', 'text', (c) => c.notNull().defaultTo('[]'))
    .addColumn('exif_thumb', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('event_id', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addUniqueConstraint('photos_project_sha', ['project_id', 'sha256'])
    .execute();
  await db.schema.createIndex('photos_upload').on('photos').columns(['upload_id', 'id']).execute();
  await db.schema
    .createIndex('photos_deployment_time')
    .on('photos')
    .columns(['deployment_id', 'taken_at'])
    .execute();
  await db.schema
    .createIndex('photos_event')
    .on('photos')
    .columns(['event_id', 'taken_at'])
    .execute();
  await db.schema.createIndex('photos_sha').on('photos').column('sha256').execute();

  await db.schema
    .createTable('jobs')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('payload', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('max_attempts', 'integer', (c) => c.notNull().defaultTo(3))
    .addColumn('run_after', 'text', (c) => c.notNull())
    .addColumn('locked_at', 'text')
    .addColumn('error', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('jobs_ready').on('jobs').columns(['status', 'run_after']).execute();

  await db.schema
    .createTable('events')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('project_id', 'text', (c) =>
      c.notNull().references('projects.id').onDelete('cascade'),
    )
    .addColumn('station_id', 'text', (c) =>
      c.notNull().references('stations.id').onDelete('cascade'),
    )
    .addColumn('start', 'text', (c) => c.notNull())
    .addColumn('end', 'text', (c) => c.notNull())
    .addColumn('photo_count', 'integer', (c) => c.notNull())
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();
  await sql`create index events_project_start on events (project_id, start, id)`.execute(db);
  await sql`create index events_station_start on events (station_id, start)`.execute(db);
}

/** Drops the ingest tables and columns. */
export async function down(db: Kysely<unknown>): Promise<void> {
  for (const table of [
    'events',
    'jobs',
    'photos',
    'upload_files',
    'card_uploads',
    'deployments',
    'stations',
  ]) {
    await db.schema.dropTable(table).ifExists().execute();
  }
  for (const column of ['gps_tolerance_m', 'tile_url', 'boundary_geojson']) {
    await db.schema.alterTable('projects').dropColumn(column).execute();
  }
}
