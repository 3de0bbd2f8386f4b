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
  const orm = drizzle(new ReleasingPool(pool) as unknown as pg.Pool, { schema });
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

/**
 * What Drizzle is given in place of the pool. Drizzle's transaction()
 * (drizzle-orm 0.45, node-postgres session) checks a client out and runs BEGIN
 * before its try/finally, so when BEGIN fails (the connection dropped between
 * checkout and the first statement, as in a database restart) the client is
 * never released and the pool loses a slot for good: after `max` such losses
 * every request waits for a connection that never comes. Here a client whose
 * first statement fails is released, as broken, before the error goes on.
 * Drizzle recognises a pool by its class name, hence the name.
 */
export class ReleasingPool {
  constructor(private readonly pool: pg.Pool) {}

  query(...args: unknown[]): unknown {
    return (this.pool.query as (...a: unknown[]) => unknown)(...args);
  }

  async connect(): Promise<pg.PoolClient> {
    const client = await this.pool.connect();
    const own = client as unknown as { query: (...a: unknown[]) => unknown };
    own.query = (...args: unknown[]) => {
      // Back to the prototype's method for every later statement of this checkout and the next ones.
      delete (own as { query?: unknown }).query;
      const result = own.query(...args);
      if (result instanceof Promise) {
        return result.catch((err: unknown) => {
          client.release(err instanceof Error ? err : new Error(String(err)));
          throw err;
        });
      }
      return result;
    };
    return client;
  }
}
