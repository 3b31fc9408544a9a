import { existsSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { constants as zlibConstants } from 'node:zlib'
import compression from 'compression'
import connectPgSimple from 'connect-pg-simple'
import { csrfSync } from 'csrf-sync'
import express, { Router, type Express } from 'express'
import session from 'express-session'
import helmet from 'helmet'
import type pg from 'pg'
import { pino } from 'pino'
import { pinoHttp } from 'pino-http'
import { createPassport } from './auth'
import { readUserWithSession, throttleTouch } from './session-store'
import { answerFreshness, setAnswerGrace } from './services/answer-freshness'
import type { Config } from './config'
import type { Db } from './db'
import type { Mailer } from './mail/mailer'
import { createOutboxMailer, type OutboxMailer } from './mail/outbox'
import { apiNotFound, errorHandler } from './middleware/error-handler'
import { authRoutes } from './routes/auth'
import { healthRoutes } from './routes/health'
import { mailboxRoutes } from './routes/mailbox'
import { requireAccess, type RouteSpec } from './routes/route-table'
import { sizingRoutes } from './routes/sizing'
import { userRoutes } from './routes/users'
import { importRoutes } from './routes/imports'
import { calibrationRoutes } from './routes/calibration'
import { projectRoutes } from './routes/projects'
import { precedentRoutes } from './routes/precedents'
import { benchmarkRoutes } from './routes/benchmarks'
import { overviewRoutes } from './routes/overview'
import { createImportRunner, type ImportRunner } from './services/import-runner'
import { markRunFailed } from './services/imports'

export interface AppOptions {
  db: Db
  pool: pg.Pool
  config: Config
  mailer: Mailer
  /** Runs uploaded imports in loader processes; one is made from the config when not given. */
  importRunner?: ImportRunner
}

export interface AppDeps extends Omit<AppOptions, 'mailer'> {
  /** The app's mailer: the outbox in front of the transport it was given. */
  mailer: OutboxMailer
  passport: ReturnType<typeof createPassport>
  csrf: ReturnType<typeof csrfSync>
  importRunner: ImportRunner
}

/** Every route module, in mounting order. A new module is added here and nowhere else. */
const ROUTE_MODULES = [healthRoutes, authRoutes, userRoutes, mailboxRoutes, sizingRoutes, importRoutes, projectRoutes, precedentRoutes, benchmarkRoutes, calibrationRoutes, overviewRoutes]

/** Builds the Express app without listening, so tests can drive it through supertest. */
export function createApp(options: AppOptions): Express {
  const { config, pool } = options
  const passport = createPassport(options.db)
  const csrf = csrfSync({ getTokenFromRequest: req => req.headers['x-csrf-token'] as string | undefined })
  const importRunner = options.importRunner ?? createImportRunner({ databaseUrl: config.databaseUrl })
  // A loader that died (killed, out of memory) leaves its run open; close it with the reason.
  importRunner.onFinished((runId, code) => {
    if (code === 0) return
    void markRunFailed(options.db, runId, `The loader process stopped before finishing (exit code ${code ?? 'none'}). Nothing of the unfinished batch was kept; run it again.`).catch(() => {})
  })
  // Every message goes through the outbox: kept first, delivered now or when the mail service is back.
  const mailer = createOutboxMailer(options.db, options.mailer)
  if (config.env !== 'test') mailer.start()
  const deps: AppDeps = { ...options, mailer, passport, csrf, importRunner }

  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', 'loopback')
  const logger = pino({ level: config.env === 'test' ? 'silent' : config.logLevel })
  app.use(
    pinoHttp({
      logger,
      autoLogging: { ignore: req => !req.url?.startsWith('/api') },
      redact: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'],
    }),
  )
  app.use(
    helmet({
      // Served over plain http on the firm's network or loopback; forcing https would break it.
      contentSecurityPolicy: { directives: { upgradeInsecureRequests: null } },
    }),
  )
  // gzip for JSON, CSV, the built dashboard, and Arrow IPC streams (not in the compressible MIME list).
  // Level 1 (fastest): under load, deflate at the default level 6 was over a tenth of the server's CPU, for
  // bodies only somewhat smaller, on a firm's own network.
  app.use(compression({ level: zlibConstants.Z_BEST_SPEED, filter: (req, res) => /apache\.arrow/.test(String(res.getHeader('Content-Type') ?? '')) || compression.filter(req, res) }))

  const PgStore = connectPgSimple(session)
  const api = Router()
  const routeTable: RouteSpec[] = ROUTE_MODULES.flatMap(m => m(deps))
  for (const spec of routeTable.filter(r => r.sessionless)) {
    if (spec.access !== 'public' || spec.method !== 'get') throw new Error(`${spec.path}: only public GET routes can be sessionless.`)
    api.get(spec.path, ...(spec.before ?? []), spec.handler)
  }
  api.use(express.json({ limit: '1mb' }))
  api.use(
    session({
      name: config.sessionCookieName,
      secret: config.sessionSecret,
      store: readUserWithSession(
        throttleTouch(new PgStore({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: config.env === 'test' ? false : 900 }), 60_000, err => logger.warn({ err }, 'session expiry not extended')),
        options.db,
      ),
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: 12 * 3600_000 },
    }),
  )
  api.use(passport.initialize())
  api.use(passport.session())
  // After the session lookup (its database round trip would not carry the request's context).
  api.use(answerFreshness)
  setAnswerGrace(options.db, config.answerGraceMs)

  for (const spec of routeTable.filter(r => !r.sessionless)) {
    // Access first (401/403 before anything else), then CSRF on state-changing methods.
    api[spec.method](spec.path, requireAccess(spec.access), csrf.csrfSynchronisedProtection, ...(spec.before ?? []), spec.handler)
  }
  api.use('/api/{*rest}', apiNotFound)
  app.use(api)
  app.locals.routeTable = routeTable
  app.locals.importRunner = importRunner
  app.locals.mailer = mailer

  if (config.dashboardDist) serveDashboard(app, resolve(config.dashboardDist))
  app.use(errorHandler)
  return app
}

function serveDashboard(app: Express, dist: string) {
  const index = join(dist, 'index.html')
  if (!existsSync(index)) throw new Error(`DASHBOARD_DIST has no index.html: ${dist}. Run the build first.`)
  app.use('/assets', express.static(join(dist, 'assets'), { immutable: true, maxAge: '1y', fallthrough: false }))
  app.use(express.static(dist, { index: false, maxAge: '1h' }))
  app.get('/{*splat}', (_req, res) => {
    res.setHeader('Cache-Control', 'no-cache')
    res.sendFile(index)
  })
}

export function routeTableOf(app: Express): RouteSpec[] {
  return app.locals.routeTable as RouteSpec[]
}
