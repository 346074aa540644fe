import type { Db } from '../db/database';
import { newId } from './ids';

/** One line of the audit trail. */
export interface AuditEntry {
  userId: string | null;
  projectId?: string | null;
  action: string;
  entity: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
}

/** Records who changed what; call inside the same transaction as the change. */
export async function recordAudit(db: Db, entry: AuditEntry): Promise<void> {
  await db
    .insertInto('audit_log')
    .values({
      id: newId(),
      at: new Date().toISOString(),
      user_id: entry.userId,
      project_id: entry.projectId ?? null,
      action: entry.action,
      entity: entry.entity,
      entity_id: entry.entityId ?? null,
      before: entry.before === undefined ? null : JSON.stringify(entry.before),
      after: entry.after === undefined ? null : JSON.stringify(entry.after),
    })
    .execute();
}
