import fs from 'node:fs';
import path from 'node:path';
import cookieParser from 'cookie-parser';
import express from 'express';
import { rateLimit } from 'express-rate-limit';
import compression from 'compression';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import type { AppContext } from './context';
import { openDatabase } from './db/client';
import { seedDatabase } from './db/seed';
import { loadConfig, type AppConfig } from './lib/env';
import { HttpError } from './lib/http-error';
import { createLogger } from './lib/logger';
import { createMailer } from './lib/mail';
import { apiNotFound, errorHandler } from './middleware/error-handler';
import { sameOriginWrites } from './middleware/same-origin';
import { sessionMiddleware } from './middleware/session';
import { configureClipBuilds, logClipBuild, stopClipBuilds } from './modules/compute/clip-builder';
import { setClipMemoryBudget } from '@shared/compute/routes-clip';
import { RoutePool } from './modules/compute/route-pool';
import { TaskPool } from './modules/compute/task-pool';
import { emitStationChanged, onStationChanged } from './modules/stations/stations.service';
import { EventHub } from './modules/events/event-hub';
import { storeMessage } from './modules/mailbox/mailbox.service';
import { ensureVersionBaselines } from './modules/stations/stations.service';
import { apiModules } from './modules';
import { setChangeSink } from './lib/route';

export interface CreateAppOptions {
  config?: Partial<AppConfig>;
  /** run the seed at start (default true) */
  seed?: boolean;
}

export interface AppInstance {
  app: express.Express;
  ctx: AppContext;
  close(): Promise<void>;
}

/** Content-Security-Policy: only our own scripts, styles, fonts and images; no third-party origins. */
const CSP_DIRECTIVES = {
  defaultSrc: ["'self'"],
  scriptSrc: ["'self'"],
  // React and the 3D canvas set inline style attributes; no inline <style> from elsewhere is loaded
  styleSrc: ["'self'", "'unsafe-inline'"],
  imgSrc: ["'self'", 'data:', 'blob:'],
  fontSrc: ["'self'", 'data:'],
  connectSrc: ["'self'"],
  workerSrc: ["'self'", 'blob:'],
  objectSrc: ["'none'"],
  baseUri: ["'self'"],
  formAction: ["'self'"],
  frameAncestors: ["'none'"],
  upgradeInsecureRequests: null,
};

export async function createApp(options: CreateAppOptions = {}): Promise<AppInstance> {
  const config = loadConfig(process.env, options.config);
  const logger = createLogger(config.logLevel);
  const handle = openDatabase(config.databaseUrl);
  // stations made before their versions were kept start their history at the version they have
  ensureVersionBaselines(handle.db);
  const mailer = await createMailer({
    smtpUrl: config.smtpUrl,
    from: config.mailFrom,
    logger,
    onReceive: (mail) => storeMessage(handle.db, mail),
  });
  configureClipBuilds({ inlineNodes: config.routeClipInlineNodes, onEvent: (e) => logClipBuild(logger, e) });
  setClipMemoryBudget(config.routeClipMemoryMb * 2 ** 20);
  const routePool =
    config.routeWorkers > 0
      ? new RoutePool({
          size: config.routeWorkers,
          queueLimit: config.routeQueueLimit,
          clipInlineNodes: config.routeClipInlineNodes,
          clipMemoryBytes: config.routeClipMemoryMb * 2 ** 20,
          logger,
        })
      : null;
  const taskPool =
    config.taskWorkers > 0
      ? new TaskPool({
          size: config.taskWorkers,
          queueLimit: config.taskQueueLimit,
          maxHeapMb: config.taskWorkerHeapMb,
          logger,
          onStationChanged: emitStationChanged,
        })
      : null;
  const ctx: AppContext = {
    config,
    db: handle.db,
    sqlite: handle.sqlite,
    logger,
    mailer,
    routePool,
    taskPool,
    events: new EventHub({
      heartbeatMs: config.eventHeartbeatMs,
      ringSize: config.eventRingSize,
      clientBufferBytes: config.eventClientBufferBytes,
      maxClients: config.eventMaxStreams,
      maxClientsPerUser: config.eventMaxStreamsPerUser,
    }),
  };
  // every committed station write, on this thread or a task worker's, reaches the live stream
  const stopStationEvents = onStationChanged((c) =>
    ctx.events.publish({ kind: 'station', id: c.stationId, version: c.version }),
  );
  if (options.seed ?? true) await seedDatabase(ctx);

  const app = express();
  app.disable('x-powered-by');
  setChangeSink(app, ctx.events);
  // the client address (rate limits, sign-in lockout) behind a reverse proxy: TRUST_PROXY
  app.set('trust proxy', config.trustProxy);
  app.use(
    helmet({ contentSecurityPolicy: { directives: CSP_DIRECTIVES }, crossOriginEmbedderPolicy: false }),
  );
  // gzip for answers over 1 kB (a long day's timeline, a large station's graph), on the thread pool;
  // an event stream is never held back for compression
  app.use(
    compression({
      filter: (req, res) =>
        !String(res.getHeader('Content-Type') ?? '').startsWith('text/event-stream') &&
        compression.filter(req, res),
    }),
  );
  app.use(
    pinoHttp({
      logger,
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({
          id: req.id,
          method: req.method,
          url: req.url,
        }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
      autoLogging: { ignore: (req) => req.url === '/api/health' || !req.url?.startsWith('/api') },
      customLogLevel: (_req, res, err) =>
        res.statusCode === 503
          ? 'warn'
          : err || res.statusCode >= 500
            ? 'error'
            : res.statusCode >= 400
              ? 'warn'
              : 'info',
    }),
  );
  app.use(
    '/api',
    rateLimit({
      windowMs: 60_000,
      limit: config.apiRequestsPerMinute,
      // X-Forwarded-For counts only from the proxies TRUST_PROXY names; any client may send one
      validate: { xForwardedForHeader: false },
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (_req, _res, next) =>
        next(new HttpError('RATE_LIMITED', 'Too many requests. Slow down and try again in a minute.')),
    }),
  );
  app.use('/api', (_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  app.use(sameOriginWrites(config.publicOrigin));
  app.use(express.json({ limit: '2mb' }));
  app.use(cookieParser());
  app.use(sessionMiddleware(ctx));
  for (const makeRouter of apiModules) app.use(makeRouter(ctx));
  app.use('/api', apiNotFound);

  const clientDir = config.clientDir;
  if (clientDir) {
    const indexHtml = path.join(clientDir, 'index.html');
    app.use(
      '/assets',
      express.static(path.join(clientDir, 'assets'), { immutable: true, maxAge: '1y', fallthrough: false }),
    );
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    // looked up per request, so a client rebuilt while the server runs is picked up
    app.get('/{*splat}', (_req, res) => {
      if (fs.existsSync(indexHtml)) return res.sendFile(indexHtml);
      res
        .status(503)
        .type('text/plain')
        .send('The client is not built yet: run `npm run build` (npm start does it for you).');
    });
  }
  app.use(errorHandler(logger));

  return {
    app,
    ctx,
    async close() {
      stopStationEvents();
      ctx.events.close();
      await routePool?.close();
      await taskPool?.close();
      await stopClipBuilds();
      await mailer.close();
      handle.close();
    },
  };
}
