/**
 * One pg Pool per process, shared by Drizzle and the session store. Short
 * connection timeouts make an unreachable database answer 503 quickly; the
 * pool reconnects by itself when the database returns.
 */
import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema.js';

export type Orm = NodePgDatabase<typeof schema>;
/** A transaction or the database itself: what a query can run on. */
export type Executor = Orm | Parameters<Parameters<Orm['transaction']>[0]>[0];

export interface Database {
  pool: pg.Pool;
  orm: Orm;
  close(): Promise<void>;
}

export interface DatabaseOptions {
  connectTimeoutMs?: number;
  max?: number;
  /** Where idle-client errors go (a dropped connection must not crash the process). */
  onPoolError?: (err: Error) => void;
}

export function createDatabase(url: string, o: DatabaseOptions = {}): Database {
  const pool = new pg.Pool({
    connectionString: url,
    max: o.max ?? 10,
    connectionTimeoutMillis: o.connectTimeoutMs ?? 3000,
    idleTimeoutMillis: 30_000,
    // A statement that hangs (database paused) fails instead of holding the request forever.
    query_timeout: 30_000,
  });
  pool.on('error', (err) => o.onPoolError?.(err));
  // A connection lost while a request holds it (e.g. between two statements of a transaction, the
  // database restarting) emits 'error' on the client, where the pool's idle listener is detached:
  // unheard, that crashes the process. The request sees the loss on its next statement (503).
  pool.on('connect', (client) => client.on('error', () => undefined));
  const orm = drizzle(pool, { schema });
  let closed = false;
  return {
    pool,
    orm,
    async close() {
      if (closed) return;
      closed = true;
      await pool.end();
    },
  };
}
