import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { KyselySessionStore } from '../../server/auth/session-store';
import { createTestContext, type TestContext } from '../support/test-app';

let ctx: TestContext;
let store: KyselySessionStore;

beforeEach(async () => {
  ctx = await createTestContext();
  store = new KyselySessionStore(ctx.db, 0);
});
afterEach(async () => {
  store.close();
  await ctx.close();
});

const sessionUntil = (iso: string) =>
  ({ cookie: { expires: new Date(iso), originalMaxAge: 1000 } }) as never;
const call = (fn: (cb: (err?: unknown) => void) => void) =>
  new Promise<void>((resolve, reject) => fn((err) => (err ? reject(err) : resolve())));
const stored = async () =>
  (
    await ctx.db
      .selectFrom('sessions')
      .select('expires_at')
      .where('sid', '=', 's1')
      .executeTakeFirstOrThrow()
  ).expires_at;

describe('session store', () => {
  it('should move the stored expiry on touch only when it gains at least a minute', async () => {
    await call((cb) => store.set('s1', sessionUntil('2030-01-01T00:00:00.000Z'), cb));
    await call((cb) => store.touch('s1', sessionUntil('2030-01-01T00:00:30.000Z'), cb));
    expect(await stored()).toBe('2030-01-01T00:00:00.000Z');
    await call((cb) => store.touch('s1', sessionUntil('2030-01-01T00:01:00.000Z'), cb));
    expect(await stored()).toBe('2030-01-01T00:01:00.000Z');
  });

  it('should write a touch for a session it has not seen (another process, or after a restart)', async () => {
    await call((cb) => store.set('s1', sessionUntil('2030-01-01T00:00:00.000Z'), cb));
    const fresh = new KyselySessionStore(ctx.db, 0);
    await call((cb) => fresh.touch('s1', sessionUntil('2030-01-01T00:00:10.000Z'), cb));
    expect(await stored()).toBe('2030-01-01T00:00:10.000Z');
    fresh.close();
  });
});
