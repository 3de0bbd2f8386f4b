/** A fresh database for one test file, in the run's throwaway cluster. */
import { inject } from 'vitest';
import { randomBytes } from 'node:crypto';
import { createDatabase } from '../../server/tools/pg.js';

export function freshDatabaseUrl(prefix = 't'): string {
  const port = inject('pgPort');
  const name = `${prefix}_${randomBytes(6).toString('hex')}`;
  return createDatabase(port, name);
}
