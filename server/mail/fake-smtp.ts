import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Db } from '../db/database';
import { newId } from '../services/ids';

/** The local stand-in for a hosted mail service: it keeps every message in the database. */
export interface FakeSmtp {
  port: number;
  url: string;
  close(): Promise<void>;
}

function addresses(value: AddressObject | AddressObject[] | undefined): string {
  if (!value) return '';
  const list = Array.isArray(value) ? value : [value];
  return list.map((a) => a.text).join(', ');
}

/** Starts an in-process SMTP server on 127.0.0.1 that stores what it receives in mail_messages. */
export async function startFakeSmtp(db: Db, port = 0): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    banner: 'Maculo local mail fake',
    size: 5 * 1024 * 1024,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then(async (mail) => {
          await db
            .insertInto('mail_messages')
            .values({
              id: newId(),
              message_id: mail.messageId ?? null,
              to_addr: addresses(mail.to),
              from_addr: addresses(mail.from),
              subject: mail.subject ?? '',
              text: mail.text ?? '',
              html: typeof mail.html === 'string' ? mail.html : null,
              received_at: new Date().toISOString(),
            })
            .execute();
          callback();
        })
        .catch((err: unknown) => callback(err instanceof Error ? err : new Error(String(err))));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const actual = (server.server.address() as AddressInfo).port;
  return {
    port: actual,
    url: `smtp://127.0.0.1:${actual}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
