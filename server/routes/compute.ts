/**
 * /api/compute: engine calls for signed-in users, run in the worker pool.
 * The engines validate their own input (shared request schemas), so the
 * body is passed through as received; 400 / 422 come back with the
 * engine's field or geometry details. Solve jobs go on the job queue
 * (server/compute/jobs.ts) and run in a worker process.
 */
import { Router } from 'express';
import { ENGINE_VERSION } from '../../shared/version.js';
import { currentUser, isUuid, type Authorizer } from '../http/authorize.js';
import { notFound } from '../../shared/errors.js';
import type { ComputePool } from '../compute/pool.js';
import type { SolveJobs, JobView } from '../compute/jobs.js';
import { COMPUTE_KINDS } from '../compute/tasks.js';

export function computeRouter(pool: ComputePool, jobs: SolveJobs, auth: Authorizer, timeLimitMs: number): Router {
  const r = Router();
  const jobId = (raw: unknown) => {
    if (!isUuid(raw)) throw notFound('Solve job');
    return raw;
  };
  // The worker's answer goes on as the JSON text it wrote (no parse and re-stringify of a large result here).
  const sendJob = (res: import('express').Response, j: JobView, extra: Record<string, unknown> = {}) => {
    const { resultJson, ...rest } = j;
    const head = JSON.stringify({ ...extra, engineVersion: ENGINE_VERSION, ...rest });
    res.type('application/json').send(resultJson === undefined ? head : `${head.slice(0, -1)},"result":${resultJson}}`);
  };

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

  r.post('/solve-jobs', auth.requireUser, async (req, res) => {
    const job = await jobs.start(currentUser(req).id, req.body);
    res.status(202).location(`${req.baseUrl}/solve-jobs/${job.id}`);
    sendJob(res, job, { jobId: job.id });
  });

  r.get('/solve-jobs/:jobId', auth.requireUser, async (req, res) => {
    sendJob(res, await jobs.get(currentUser(req).id, jobId(req.params['jobId'])));
  });

  r.delete('/solve-jobs/:jobId', auth.requireUser, async (req, res) => {
    sendJob(res, await jobs.cancel(currentUser(req).id, jobId(req.params['jobId'])));
  });

  return r;
}
