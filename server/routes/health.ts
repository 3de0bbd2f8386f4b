/** GET /api/health: public; reports whether the database answers. */
import { Router } from 'express';
import type pg from 'pg';
import { ENGINE_VERSION } from '../../shared/version.js';

export function healthRouter(pool: pg.Pool): Router {
  const r = Router();
  r.get('/', async (req, res) => {
    try {
      await pool.query('SELECT 1');
      res.json({ status: 'ok', database: 'reachable', engineVersion: ENGINE_VERSION });
    } catch (err) {
      req.log.warn({ err }, 'health check: database unreachable');
      res.status(503).json({ status: 'degraded', database: 'unreachable', engineVersion: ENGINE_VERSION });
    }
  });
  return r;
}
