/** Accounts; `is_admin` is the global admin flag. */
export interface UsersTable {
  id: string;
  email: string;
  name: string;
  password_hash: string | null;
  is_admin: number;
  disabled: number;
  created_at: string;
  last_login_at: string | null;
}

/** express-session rows; `user_id` lets a disabled user's sessions be ended at once. */
export interface SessionsTable {
  sid: string;
  user_id: string | null;
  sess: string;
  expires_at: string;
}

/** Invitations by e-mail; only the SHA-256 of the token is stored. */
export interface InvitationsTable {
  id: string;
  project_id: string;
  email: string;
  role: string;
  token_hash: string;
  invited_by: string;
  created_at: string;
  expires_at: string;
  accepted_at: string | null;
  accepted_by: string | null;
}

/** Single-use, time-limited password reset tokens (hashed). */
export interface PasswordResetsTable {
  id: string;
  user_id: string;
  token_hash: string;
  created_at: string;
  expires_at: string;
  used_at: string | null;
}
