/**
 * server/db/client.ts: a transaction whose BEGIN fails must give its pool
 * client back. Drizzle's transaction() (drizzle-orm 0.45) runs BEGIN before
 * its try/finally, so on a connection that died between checkout and BEGIN
 * it never released the client; found when the fault test's teardown hung in
 * pool.end() with one client checked out, no query, its socket destroyed.
 * With max = 1 a lost slot means every later transaction waits for ever.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import type pg from 'pg';
import { freshDatabaseUrl } from '../support/db.js';
import { createDatabase, ReleasingPool, type Database } from '../../server/db/client.js';

/** Hands the pool an idle client whose socket is already gone (as after a database restart). */
async function plantDeadIdleClient(pool: pg.Pool): Promise<void> {
  const client = await pool.connect();
  (client as unknown as { connection: { stream: { destroy(): void } } }).connection.stream.destroy();
  client.release();
}

describe('database client', () => {
  let db: Database;
  beforeAll(() => {
    db = createDatabase(freshDatabaseUrl(), { max: 1, connectTimeoutMs: 1000 });
  });
  afterAll(async () => {
    await db.close();
  });

  it('a transaction whose BEGIN fails on a dead connection releases the client: the next transaction runs', async () => {
    await plantDeadIdleClient(db.pool);
    let failed: unknown;
    try {
      await db.orm.transaction(async (tx) => tx.execute(sql`SELECT 1`));
    } catch (err) {
      failed = err;
    }
    // Either the dead client failed its BEGIN (and was released here), or the pool noticed first and gave a fresh one.
    if (failed) expect(String(failed)).toMatch(/Failed query: begin/);
    const r = await db.orm.transaction(async (tx) => tx.execute<{ n: number }>(sql`SELECT 2 AS n`));
    expect(r.rows[0]!.n).toBe(2);
    expect(db.pool.totalCount).toBeLessThanOrEqual(1);
    expect(db.pool.waitingCount).toBe(0);
  });

  it('ReleasingPool releases a client whose first statement fails, and leaves later failures to the holder', async () => {
    const pool = new ReleasingPool(db.pool);
    const before = db.pool.totalCount;
    const c = await pool.connect();
    await expect(c.query('SELEC 1')).rejects.toThrow(/syntax/);
    // Released as broken: removed from the pool, nothing checked out.
    expect(db.pool.totalCount).toBeLessThanOrEqual(before);
    expect(db.pool.idleCount).toBe(db.pool.totalCount);

    const d = await pool.connect();
    await d.query('SELECT 1');
    await expect(d.query('SELEC 2')).rejects.toThrow(/syntax/);
    // The second statement's failure is the holder's to handle: still checked out until released.
    expect(db.pool.idleCount).toBe(db.pool.totalCount - 1);
    d.release();
    expect(db.pool.idleCount).toBe(db.pool.totalCount);
  });
});
