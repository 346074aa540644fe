/**
 * Looks inside the Sort queue without HTTP: the query plan SQLite picks for each statement of
 * `leaseNext`, how long each statement takes in this process, and how the leasing statement copes
 * when many events at the head of the queue are leased to other reviewers.
 */
import { Kysely, SqliteDialect, type LogEvent } from 'kysely';
import { join } from 'node:path';
import { openDatabase, type Database, type Db } from '../server/db/database';
import { leaseNext, releaseLeases } from '../server/services/sort.service';
import { meFor } from '../server/services/users.service';
import { sortNextQuerySchema } from '../shared/sort';
import { round } from './report';

/** One statement of the queue with its plan and median time. */
export interface StatementProfile {
  sql: string;
  plan: string[];
  medianMs: number;
}

/** What the queue's statements cost in one thread. */
export interface QueueDiagnosis {
  /** Per order ('oldest', 'station'): the statements, their plans and the service's median time. */
  orders: Record<string, { serviceMedianMs: number; statements: StatementProfile[] }>;
  /** The trivial endpoint's own work (`meFor`), median ms. */
  meMedianMs: number;
  /** Leasing statement median ms when this many events at the head are leased to someone else. */
  foreignLeases: { leased: number; oldestMs: number; stationMs: number }[];
}

/** Median of unsorted values. */
export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? s[Math.floor(s.length / 2)]! : NaN;
}

/** A Kysely on the benchmark database that records every statement and its duration. */
export function loggingDb(path: string) {
  const { sqlite } = openDatabase(path);
  const events: LogEvent[] = [];
  const db: Db = new Kysely<Database>({
    dialect: new SqliteDialect({ database: sqlite }),
    log: (e) => {
      events.push(e);
    },
  });
  return { db, sqlite, events };
}

function shortSql(sql: string): string {
  return sql.replace(/\s+/g, ' ').trim();
}

/** Calls `call` `runs` times; its median time and each statement's parameters and times. */
export async function timeRepeated(events: LogEvent[], runs: number, call: () => Promise<unknown>) {
  const totals: number[] = [];
  const byStatement = new Map<string, { params: readonly unknown[]; ms: number[] }>();
  for (let i = 0; i < runs; i++) {
    events.length = 0;
    const t0 = performance.now();
    await call();
    totals.push(performance.now() - t0);
    for (const e of events) {
      const key = shortSql(e.query.sql);
      const entry = byStatement.get(key) ?? { params: e.query.parameters, ms: [] };
      entry.ms.push(e.queryDurationMillis);
      byStatement.set(key, entry);
    }
  }
  return { median: median(totals), byStatement };
}

/** Each statement with SQLite's query plan for it and its median time. */
export function profileStatements(
  sqlite: ReturnType<typeof openDatabase>['sqlite'],
  byStatement: Map<string, { params: readonly unknown[]; ms: number[] }>,
): StatementProfile[] {
  return [...byStatement].map(([sql, { params, ms }]) => ({
    sql,
    plan: (sqlite.prepare(`explain query plan ${sql}`).all(...params) as { detail: string }[]).map(
      (row) => row.detail,
    ),
    medianMs: round(median(ms), 3),
  }));
}

async function leaseHead(db: Db, projectId: string, count: number): Promise<void> {
  const until = new Date(Date.now() + 3600_000).toISOString();
  await db
    .updateTable('events')
    .set({ lease_holder: 'someone-else', lease_until: until })
    .where('id', 'in', (eb) =>
      eb
        .selectFrom('events')
        .select('id')
        .where('project_id', '=', projectId)
        .where('label', 'is', null)
        .orderBy('start')
        .orderBy('id')
        .limit(count),
    )
    .execute();
}

/**
 * Profiles the queue for one reviewer (whose leases are given back afterwards) on the database in
 * `dataDir`; run it before the server starts.
 */
export async function diagnoseQueue(
  dataDir: string,
  projectId: string,
  reviewerId: string,
  runs = 30,
): Promise<QueueDiagnosis> {
  const { db, sqlite, events } = loggingDb(join(dataDir, 'maculo.sqlite'));
  try {
    const project = await db
      .selectFrom('projects')
      .selectAll()
      .where('id', '=', projectId)
      .executeTakeFirstOrThrow();
    const user = { id: reviewerId };
    const orders: QueueDiagnosis['orders'] = {};
    for (const order of ['oldest', 'station'] as const) {
      const query = sortNextQuerySchema.parse({ limit: 10, order });
      const timed = await timeRepeated(events, runs, () =>
        leaseNext(db, project, user, 'reviewer', query),
      );
      orders[order] = {
        serviceMedianMs: round(timed.median, 2),
        statements: profileStatements(sqlite, timed.byStatement),
      };
      await releaseLeases(db, projectId, reviewerId);
    }
    const me = await timeRepeated(events, runs, () => meFor(db, reviewerId));

    const foreignLeases: QueueDiagnosis['foreignLeases'] = [];
    for (const leased of [0, 200, 2000, 10000]) {
      await leaseHead(db, projectId, leased);
      const row = { leased, oldestMs: NaN, stationMs: NaN };
      for (const order of ['oldest', 'station'] as const) {
        const query = sortNextQuerySchema.parse({ limit: 10, order });
        const timed = await timeRepeated(events, 20, () =>
          leaseNext(db, project, user, 'reviewer', query),
        );
        row[order === 'oldest' ? 'oldestMs' : 'stationMs'] = round(timed.median, 2);
        await releaseLeases(db, projectId, reviewerId);
      }
      await releaseLeases(db, projectId, 'someone-else');
      foreignLeases.push(row);
    }
    return { orders, meMedianMs: round(me.median, 3), foreignLeases };
  } finally {
    await db.destroy();
  }
}
