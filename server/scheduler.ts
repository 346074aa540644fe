import type { Logger } from 'pino';
import type { Db } from './db/database';
import type { Mailer } from './mail/mailer';
import { sendDueDigests } from './services/digest.service';

/** Periodic work of a running server: the daily curators' digest (checked every half hour). */
export function startScheduler(deps: {
  db: Db;
  mailer: Mailer;
  log: Logger;
  publicUrl: string;
}): () => void {
  const tick = () => {
    sendDueDigests(deps.db, deps.mailer, deps.publicUrl)
      .then((sent) => sent && deps.log.info({ sent }, 'daily curate digests sent'))
      .catch((err: unknown) => deps.log.error({ err }, 'digest schedule failed'));
  };
  const timer = setInterval(tick, 30 * 60 * 1000);
  timer.unref();
  return () => clearInterval(timer);
}
