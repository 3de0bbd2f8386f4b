/**
 * /api/compute: engine calls for signed-in users, run in the worker pool.
 * The engines validate their own input (shared request schemas), so the
 * body is passed through as received; 400 / 422 come back with the
 * engine's field or geometry details.
 */
import { Router } from 'express';
import { ENGINE_VERSION } from '../../shared/version.js';
import { currentUser, isUuid, type Authorizer } from '../http/authorize.js';
import { notFound } from '../http/errors.js';
import type { ComputePool } from '../compute/pool.js';
import type { SolveJobs, JobView } from '../compute/jobs.js';
import { COMPUTE_KINDS } from '../compute/tasks.js';

export function computeRouter(pool: ComputePool, jobs: SolveJobs, auth: Authorizer, timeLimitMs: number): Router {
  const r = Router();
  const jobId = (raw: unknown) => {
    if (!isUuid(raw)) throw notFound('Solve job');
    return raw;
  };
  const jobBody = (j: JobView) => ({ engineVersion: ENGINE_VERSION, ...j });

  for (const kind of COMPUTE_KINDS) {
    r.post(`/${kind}`, auth.requireUser, async (req, res) => {
      // A client that goes away frees its worker instead of waiting out the time limit.
      const gone = new AbortController();
      res.on('close', () => {
        if (!res.writableFinished) gone.abort();
      });
      // The worker hands back JSON text; wrapping it keeps the big result off this thread's JSON.stringify.
      const json = await pool.runJson(kind, req.body, { timeLimitMs, signal: gone.signal });
      res.type('application/json').send(`{"engineVersion":${JSON.stringify(ENGINE_VERSION)},"result":${json}}`);
    });
  }

  r.post('/solve-jobs', auth.requireUser, (req, res) => {
    const job = jobs.start(currentUser(req).id, req.body);
    res.status(202).location(`${req.baseUrl}/solve-jobs/${job.id}`).json({ jobId: job.id, ...jobBody(job) });
  });

  r.get('/solve-jobs/:jobId', auth.requireUser, (req, res) => {
    res.json(jobBody(jobs.get(currentUser(req).id, jobId(req.params['jobId']))));
  });

  r.delete('/solve-jobs/:jobId', auth.requireUser, (req, res) => {
    res.json(jobBody(jobs.cancel(currentUser(req).id, jobId(req.params['jobId']))));
  });

  return r;
}
