/**
 * The Express application: API under /api, the built Angular app (with SPA
 * fallback) everywhere else. Routes are thin; services talk to Drizzle;
 * engine calls go to the worker pool; every error reaches one handler.
 */
import { jsonBody } from './http/body.js';
import { refuseNulCharacters } from './http/text.js';
import { isUploadRequest } from './http/upload.js';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import express, { type Express, type RequestHandler } from 'express';
import compression from 'compression';
import type { Config } from './config.js';
import type { Database } from './db/client.js';
import { createLogger, requestLogger } from './http/logging.js';
import { securityHeaders } from './http/security.js';
import { csrfProtection } from './http/csrf.js';
import { absoluteTimeout, createSession } from './http/session.js';
import { createAuthorizer } from './http/authorize.js';
import { apiNotFound, errorHandler, HttpError } from './http/errors.js';
import { Accounts } from './services/accounts.js';
import { Teams } from './services/teams.js';
import { Vehicles } from './services/vehicles.js';
import { AxleDesigns } from './services/axle-designs.js';
import { Proposals } from './services/proposals.js';
import { Configurations } from './services/configurations.js';
import { Invitations } from './services/invitations.js';
import { invitationLinksRouter, teamInvitationsRouter } from './routes/invitations.js';
import { ApiTokens } from './services/api-tokens.js';
import { bearerAuth } from './http/bearer.js';
import { apiTokensRouter } from './routes/api-tokens.js';
import { Activity } from './services/activity.js';
import { activityRouter } from './routes/activity.js';
import { Programmes } from './services/programmes.js';
import { programmesRouter, teamProgrammesRouter } from './routes/programmes.js';
import { createComputePool, PRIORITIES } from './compute/pool.js';
import { SolveJobs } from './compute/jobs.js';
import { JobQueue } from './compute/queue.js';
import { QueueRunner } from './compute/runner.js';
import { queueHandlers } from './compute/handlers.js';
import { workerOptions } from './worker.js';
import { healthRouter } from './routes/health.js';
import { authRouter } from './routes/auth.js';
import { teamsRouter } from './routes/teams.js';
import { vehiclesRouter } from './routes/vehicles.js';
import { axleDesignsRouter, vehicleAxleDesignsRouter } from './routes/axle-designs.js';
import { computeRouter } from './routes/compute.js';
import { configurationsRouter } from './routes/configurations.js';
import { reviewGatesRouter } from './routes/review-gates.js';
import { ReviewGates } from './services/review-gates.js';
import { LatestPreview } from './services/latest-preview.js';
import { ReviewRecord } from './services/review-record.js';
import { devMailRouter } from './routes/dev-mail.js';
import { MailWorker } from './mail/outbox.js';
import { RigMeasurements } from './services/rig-measurements.js';
import { rigMeasurementsRouter } from './routes/rig-measurements.js';
import { Studies } from './services/studies.js';
import { programmeStudiesRouter, studiesRouter } from './routes/studies.js';

export type RollwiseApp = Express & {
  /** Stops the app's own timers, workers and session store (not the database). */
  close(): Promise<void>;
  /** The outbox worker, when SMTP_URL is set (tests run passes with it). */
  mail: MailWorker | undefined;
};

const BODY_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** Bodies must be JSON; anything else would silently arrive empty. */
const requireJsonBody: RequestHandler = (req, _res, next) => {
  const hasBody = Number(req.get('content-length') ?? 0) > 0 || req.get('transfer-encoding') !== undefined;
  // The hardpoint import takes a multipart file upload (server/http/upload.ts checks it).
  if (BODY_METHODS.has(req.method) && hasBody && !req.is('application/json') && !isUploadRequest(req)) {
    return next(new HttpError(415, 'unsupported_media_type', 'Send the request body as application/json'));
  }
  next();
};

export function createApp(config: Config, db: Database): RollwiseApp {
  const logger = createLogger(config.logLevel);
  const app = express() as RollwiseApp;
  app.disable('x-powered-by');
  if (config.production) app.set('trust proxy', 1);

  const session = createSession(config, db.pool, (err) => logger.warn({ err }, 'session store error'));
  // The programmes service needs the configurations service (created below); the authorizer only its read check.
  let programmes: Programmes | undefined;
  const auth = createAuthorizer(db.orm, (userId, teamId) => programmes!.instructorReads(userId, teamId));
  const accounts = new Accounts(db.orm, config.bcryptRounds, {
    secret: config.sessionSecret,
    publicUrl: config.publicUrl,
    passwordResetTtlMs: config.passwordResetTtlMs,
  });
  const invitations = new Invitations(db.orm, accounts, { secret: config.sessionSecret, publicUrl: config.publicUrl, ttlMs: config.invitationTtlMs });
  const teams = new Teams(db.orm);
  const apiTokens = new ApiTokens(db.orm);
  const activity = new Activity(db.orm);
  const vehicles = new Vehicles(db.orm);
  const designs = new AxleDesigns(db.orm);
  const proposals = new Proposals(db.orm, designs);
  const pool = createComputePool({ threads: config.computeThreads, warm: config.computeWarmStart, niceIncrement: config.computeNice ? PRIORITIES.request : 0 });
  const queue = new JobQueue(db.pool);
  const jobs = new SolveJobs(db, queue, { timeLimitMs: config.solveJobTimeLimitMs, retainMs: config.solveJobRetainMs });
  // Tests and single-process set-ups: a queue worker in this process (npm start runs a worker process instead).
  const runner = config.inProcessWorker ? new QueueRunner(db, { ...workerOptions(config, logger), warm: false }, queueHandlers) : undefined;
  const runnerStarted = runner?.start().catch((err: unknown) => logger.error({ err }, 'the in-process queue worker could not start'));
  const configurations = new Configurations(db.orm, pool, config.computeTimeLimitMs, config.publicUrl);
  programmes = new Programmes(db.orm, configurations);
  const studies = new Studies(db, queue, pool, { designs, vehicles, configurations, proposals }, {
    maxActivePerTeam: config.studyMaxActivePerTeam,
    computeTimeLimitMs: config.computeTimeLimitMs,
    chunkExpireSeconds: config.studyChunkExpireSeconds,
  });

  const mail = config.smtpUrl
    ? new MailWorker(db.orm, {
        smtpUrl: config.smtpUrl,
        from: config.mailFrom,
        pollMs: config.mailPollMs,
        maxAttempts: config.mailMaxAttempts,
        backoffBaseMs: config.mailBackoffMs,
        logger,
      })
    : undefined;
  if (mail) mail.start();
  else logger.warn('SMTP_URL is not set: mail stays in the outbox until a mail server is configured');
  app.mail = mail;

  app.use(requestLogger(logger));
  app.use(securityHeaders(config.staticDir, config.production));
  app.use(compression());

  const api = express.Router();
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  // What will be refused is refused before the body is read (issue 12 §4): the content type, the token, the
  // CSRF header, then who is signed in; only then is the body parsed, with its route's limit (http/body.ts).
  api.use(requireJsonBody);
  api.use(bearerAuth(apiTokens));
  api.use(csrfProtection(config.publicUrl));
  api.use('/health', healthRouter(db.pool));
  // A token-authenticated request neither reads nor creates a session.
  api.use((req, res, next) => (req.tokenGrant ? next() : session.middleware(req, res, next)));
  api.use(absoluteTimeout(config.sessionAbsoluteMs));
  api.use(jsonBody(config.bodyLimit));
  api.use(refuseNulCharacters);
  api.use('/auth/tokens', apiTokensRouter(apiTokens, auth));
  api.use('/auth', authRouter(config, accounts, db.pool, auth));
  api.use('/teams/:teamId/vehicles/:vehicleId/axle-designs', vehicleAxleDesignsRouter(designs, vehicles, auth));
  api.use('/teams/:teamId/vehicles', vehiclesRouter(vehicles, auth));
  api.use('/teams/:teamId/axle-designs', axleDesignsRouter(designs, proposals, auth));
  api.use('/invitations', invitationLinksRouter(invitations, accounts, config.addressLimit));
  api.use('/teams/:teamId/invitations', teamInvitationsRouter(invitations, auth));
  api.use('/teams/:teamId/configurations', configurationsRouter(configurations, auth));
  api.use(
    '/teams/:teamId/configurations',
    reviewGatesRouter(
      configurations,
      new ReviewGates(db.orm, configurations, pool, config.computeTimeLimitMs),
      new LatestPreview(db.orm, configurations),
      new ReviewRecord(db.orm, configurations, pool, config.computeTimeLimitMs),
      auth,
      config.chromiumPath,
    ),
  );
  api.use('/teams/:teamId/studies', studiesRouter(studies, auth));
  if (!config.production) api.use('/dev/mail', devMailRouter(db.orm, auth));
  api.use('/teams/:teamId', rigMeasurementsRouter(new RigMeasurements(db.orm, configurations, pool, config.computeTimeLimitMs), auth));
  api.use('/teams/:teamId', activityRouter(activity, designs, auth));
  api.use('/teams/:teamId/programmes', teamProgrammesRouter(programmes, auth));
  api.use('/programmes/:programmeId/studies', programmeStudiesRouter(studies, programmes, auth));
  api.use('/programmes', programmesRouter(programmes, auth));
  api.use('/teams', teamsRouter(teams, auth));
  api.use('/compute', computeRouter(pool, jobs, auth, config.computeTimeLimitMs));
  api.use(apiNotFound);
  app.use('/api', api);

  // The built Angular app: hashed assets cached long, index.html never.
  const index = join(config.staticDir, 'index.html');
  app.use(
    express.static(config.staticDir, {
      index: false,
      setHeaders(res, path) {
        if (/-[A-Z0-9]{8}\.(js|css|woff2?|ttf|otf|svg|png|jpe?g|webp)$/.test(path)) {
          res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
        }
      },
    }),
  );
  app.get('/{*splat}', (req, res, next) => {
    // A missing asset (an old hashed file after a deploy) is a 404, not the page.
    if (/\.[A-Za-z0-9]{1,8}$/.test(req.path)) return next();
    if (!existsSync(index)) {
      return next(new HttpError(404, 'not_found', 'The web app has not been built on this server (run `npm run build`)'));
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  app.use((req, _res, next) => next(new HttpError(404, 'not_found', `Nothing at ${req.method} ${req.path}`)));
  app.use(errorHandler);

  app.close = async () => {
    session.close();
    jobs.close();
    await runnerStarted;
    await runner?.stop(5_000);
    await queue.stop();
    await mail?.stop();
    await pool.close();
  };
  return app;
}
