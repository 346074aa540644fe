/** Who changed what and when; before/after are JSON text. */
export interface AuditLogTable {
  id: string;
  at: string;
  user_id: string | null;
  project_id: string | null;
  action: string;
  entity: string;
  entity_id: string | null;
  before: string | null;
  after: string | null;
}

/** Messages caught by the local SMTP fake (development and tests). */
export interface MailMessagesTable {
  id: string;
  message_id: string | null;
  to_addr: string;
  from_addr: string;
  subject: string;
  text: string;
  html: string | null;
  received_at: string;
}
