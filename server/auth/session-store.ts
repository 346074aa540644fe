import session from 'express-session';
import type { Db } from '../db/database';

const DAY_MS = 24 * 60 * 60 * 1000;
const TOUCH_STEP_MS = 60 * 1000;

type Callback<T = void> = (err?: unknown, value?: T) => void;

function userOf(sess: session.SessionData): string | null {
  const passportData = (sess as unknown as { passport?: { user?: unknown } }).passport;
  return typeof passportData?.user === 'string' ? passportData.user : null;
}

/** express-session store on the app's SQLite database: sessions survive a restart. */
export class KyselySessionStore extends session.Store {
  private pruneTimer: NodeJS.Timeout | null = null;
  /** The expiry last read or written per session id, so a touch writes only when it moves. */
  private readonly knownExpiry = new Map<string, string>();

  constructor(
    private readonly db: Db,
    pruneEveryMs = 15 * 60 * 1000,
  ) {
    super();
    if (pruneEveryMs > 0) {
      this.pruneTimer = setInterval(() => void this.prune(), pruneEveryMs);
      this.pruneTimer.unref();
    }
  }

  override get(sid: string, cb: Callback<session.SessionData | null>): void {
    this.db
      .selectFrom('sessions')
      .select(['sess', 'expires_at'])
      .where('sid', '=', sid)
      .executeTakeFirst()
      .then((row) => {
        if (!row || row.expires_at <= new Date().toISOString()) return cb(null, null);
        this.remember(sid, row.expires_at);
        cb(null, JSON.parse(row.sess) as session.SessionData);
      }, cb);
  }

  override set(sid: string, sess: session.SessionData, cb?: Callback): void {
    const expires = this.expiryOf(sess);
    const row = { sid, user_id: userOf(sess), sess: JSON.stringify(sess), expires_at: expires };
    this.db
      .insertInto('sessions')
      .values(row)
      .onConflict((oc) =>
        oc.column('sid').doUpdateSet({ user_id: row.user_id, sess: row.sess, expires_at: expires }),
      )
      .execute()
      .then(
        () => {
          this.remember(sid, expires);
          cb?.();
        },
        (err: unknown) => cb?.(err),
      );
  }

  override destroy(sid: string, cb?: Callback): void {
    this.knownExpiry.delete(sid);
    this.db
      .deleteFrom('sessions')
      .where('sid', '=', sid)
      .execute()
      .then(
        () => cb?.(),
        (err: unknown) => cb?.(err),
      );
  }

  /**
   * Rolling sessions touch on every request; the stored expiry moves only when it would gain at
   * least a minute, which saves a database write on almost every request.
   */
  override touch(sid: string, sess: session.SessionData, cb?: Callback): void {
    const expires = this.expiryOf(sess);
    const known = this.knownExpiry.get(sid);
    if (known && Date.parse(expires) - Date.parse(known) < TOUCH_STEP_MS) {
      cb?.();
      return;
    }
    this.db
      .updateTable('sessions')
      .set({ expires_at: expires })
      .where('sid', '=', sid)
      .execute()
      .then(
        () => {
          this.remember(sid, expires);
          cb?.();
        },
        (err: unknown) => cb?.(err),
      );
  }

  private remember(sid: string, expires: string): void {
    // Bounded: forgetting an entry only costs one write at that session's next touch.
    if (this.knownExpiry.size >= 50_000) this.knownExpiry.clear();
    this.knownExpiry.set(sid, expires);
  }

  /** Deletes expired sessions; returns how many went. */
  async prune(): Promise<number> {
    const result = await this.db
      .deleteFrom('sessions')
      .where('expires_at', '<=', new Date().toISOString())
      .executeTakeFirst();
    return Number(result.numDeletedRows);
  }

  /** Ends every session of one user (disabled account, password reset). */
  async destroyForUser(userId: string, exceptSid?: string): Promise<void> {
    this.knownExpiry.clear();
    let query = this.db.deleteFrom('sessions').where('user_id', '=', userId);
    if (exceptSid) query = query.where('sid', '!=', exceptSid);
    await query.execute();
  }

  /** Stops the prune timer (tests, shutdown). */
  close(): void {
    if (this.pruneTimer) clearInterval(this.pruneTimer);
    this.pruneTimer = null;
  }

  private expiryOf(sess: session.SessionData): string {
    const expires = sess.cookie?.expires;
    const when = expires ? new Date(expires) : new Date(Date.now() + DAY_MS);
    return when.toISOString();
  }
}
