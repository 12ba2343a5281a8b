import path from 'node:path'
import { fileURLToPath } from 'node:url'
import connectPgSimple from 'connect-pg-simple'
import express from 'express'
import session from 'express-session'
import helmet from 'helmet'
import type pg from 'pg'
import { ApiRoutes } from './http/define-route'
import { csrfProtection } from './http/csrf'
import { errorHandler, notFoundApi } from './http/errors'
import { loadActor } from './http/session-user'
import { authRoutes } from './routes/auth.routes'
import { floorsRoutes } from './routes/floors.routes'
import { runsRoutes } from './routes/runs.routes'
import { scenariosRoutes } from './routes/scenarios.routes'
import { sitesRoutes } from './routes/sites.routes'
import { systemRoutes } from './routes/system.routes'
import { usersRoutes } from './routes/users.routes'
import { plansRoutes } from './routes/plans.routes'
import { stalenessRoutes } from './routes/staleness.routes'
import { drillsRoutes } from './routes/drills.routes'
import type { ServiceContext } from './services/context'

/** Each feature registers its routes here; order only matters for identical paths. */
const FEATURES: ((api: ApiRoutes, ctx: ServiceContext) => void)[] = [
  systemRoutes,
  authRoutes,
  usersRoutes,
  sitesRoutes,
  floorsRoutes,
  scenariosRoutes,
  runsRoutes,
  plansRoutes,
  drillsRoutes,
  stalenessRoutes,
]

export interface AppOptions {
  pool: pg.Pool
  sessionSecret: string
  /** Folder of the built client (vite build); omitted in API-only tests. */
  clientDir?: string | null
}

export const DEFAULT_CLIENT_DIR = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../dist')

export function createApp(ctx: ServiceContext, opts: AppOptions) {
  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', 'loopback')
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Konva and ECharts draw on canvas; blob: and data: images carry uploaded floor plans and snapshots.
          'img-src': ["'self'", 'data:', 'blob:'],
          'script-src': ["'self'"],
          'style-src': ["'self'", "'unsafe-inline'"],
        },
      },
    }),
  )
  app.use('/api', express.json({ limit: '2mb' }))

  const PgStore = connectPgSimple(session)
  app.use(
    '/api',
    session({
      // No touch: the fixed 12-hour expiry is enough, and touching would write the session row on every request.
      store: new PgStore({ pool: opts.pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 600, disableTouch: true }),
      name: 'dw_sid',
      secret: opts.sessionSecret,
      resave: false,
      saveUninitialized: false,
      rolling: false,
      cookie: { httpOnly: true, sameSite: 'lax', secure: ctx.config.secureCookies, maxAge: 12 * 3600_000, path: '/' },
    }),
  )
  app.use('/api', csrfProtection({ secureCookies: ctx.config.secureCookies }))
  app.use('/api', loadActor(ctx.db))

  const api = new ApiRoutes(express.Router())
  for (const feature of FEATURES) feature(api, ctx)
  app.use(api.router)
  app.use('/api', notFoundApi)

  if (opts.clientDir) {
    app.use(express.static(opts.clientDir, { index: false, maxAge: '1h' }))
    // Client-side routes: every non-API GET gets the single page.
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(opts.clientDir!, 'index.html')))
  }
  app.use(errorHandler)
  return { app, specs: api.specs }
}
