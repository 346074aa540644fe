import SQLite from 'better-sqlite3';
import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { Kysely, SqliteDialect } from 'kysely';
import type { AnalysesTable } from './schema/analyses.table';
import type { AuditLogTable, MailMessagesTable } from './schema/audit.table';
import type { DuplicateDismissalsTable, IdentityChangesTable } from './schema/curate.table';
import type {
  CardUploadsTable,
  DeploymentsTable,
  EventsTable,
  JobsTable,
  PhotosTable,
  StationsTable,
  UploadFilesTable,
} from './schema/ingest.table';
import type {
  AliasesTable,
  CallsTable,
  IndividualsTable,
  ReferencePhotosTable,
} from './schema/identify.table';
import type { PatternFeaturesTable } from './schema/pattern.table';
import type { MembershipsTable, ProjectsTable } from './schema/projects.table';
import type { ProjectSpeciesTable, SightingsTable } from './schema/sort.table';
import type {
  InvitationsTable,
  PasswordResetsTable,
  SessionsTable,
  UsersTable,
} from './schema/users.table';

/** Every table Maculo stores, as Kysely sees them. */
export interface Database {
  users: UsersTable;
  sessions: SessionsTable;
  invitations: InvitationsTable;
  password_resets: PasswordResetsTable;
  projects: ProjectsTable;
  memberships: MembershipsTable;
  audit_log: AuditLogTable;
  mail_messages: MailMessagesTable;
  stations: StationsTable;
  deployments: DeploymentsTable;
  card_uploads: CardUploadsTable;
  upload_files: UploadFilesTable;
  photos: PhotosTable;
  jobs: JobsTable;
  events: EventsTable;
  project_species: ProjectSpeciesTable;
  sightings: SightingsTable;
  individuals: IndividualsTable;
  reference_photos: ReferencePhotosTable;
  aliases: AliasesTable;
  calls: CallsTable;
  identity_changes: IdentityChangesTable;
  duplicate_dismissals: DuplicateDismissalsTable;
  analyses: AnalysesTable;
  pattern_features: PatternFeaturesTable;
}

/** The app's database handle. */
export type Db = Kysely<Database>;

/** Opens (creating if needed) the SQLite file with the pragmas the app relies on. */
export function openDatabase(path: string): { db: Db; sqlite: SQLite.Database } {
  if (path !== ':memory:') mkdirSync(dirname(path), { recursive: true });
  const sqlite = new SQLite(path);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('synchronous = NORMAL');
  sqlite.pragma('busy_timeout = 5000');
  const db = new Kysely<Database>({
    dialect: new SqliteDialect({ database: withStatementCache(sqlite) }),
  });
  return { db, sqlite };
}

/**
 * The SQLite handle Kysely sees, keeping prepared statements for reuse: Kysely asks for a fresh
 * statement on every query, and preparing was about a tenth of the server's CPU per request. The
 * most recently used 500 statements are kept (lists of varying length make new SQL texts). Kysely
 * runs each statement to completion at once (no streaming here), so one statement is never busy
 * twice.
 */
function withStatementCache(sqlite: SQLite.Database, max = 500) {
  const cache = new Map<string, SQLite.Statement>();
  return {
    close(): void {
      cache.clear();
      sqlite.close();
    },
    prepare(text: string): SQLite.Statement {
      let statement = cache.get(text);
      if (statement) {
        cache.delete(text);
      } else {
        statement = sqlite.prepare(text);
        if (cache.size >= max) cache.delete(cache.keys().next().value!);
      }
      cache.set(text, statement);
      return statement;
    },
  };
}
