import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { createApp, DEFAULT_CLIENT_DIR } from './app'
import type { Config } from './config'
import { openDatabase, type DbHandle } from './db/database'
import { migrateToLatest } from './db/migrator'
import { startMailDispatcher, type MailDispatcher } from './mail/dispatcher'
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp'
import { createMailTransport } from './mail/transport'
import { JobQueue } from './jobs/queue'
import { getOrCreateSecret } from './repositories/secrets.repo'
import type { ServiceContext } from './services/context'
import { MailService } from './services/mail.service'

export interface Runtime {
  handle: DbHandle
  ctx: ServiceContext
  fakeSmtp: FakeSmtp | null
  dispatcher: MailDispatcher
  app: ReturnType<typeof createApp>['app']
  /** Starts HTTP; resolves with the bound URL. */
  listen(port?: number, host?: string): Promise<string>
  close(): Promise<void>
  /** Background services added by features (job workers, schedulers); closed in reverse order. */
  onClose(fn: () => Promise<void> | void): void
}

/** Builds the whole server against a database URL: migrations, secrets, mail path, HTTP app. */
export async function startRuntime(config: Config, databaseUrl: string, opts: { clientDir?: string | null } = {}): Promise<Runtime> {
  const handle = openDatabase(databaseUrl)
  await migrateToLatest(handle.db)
  const sessionSecret = config.sessionSecret ?? (await getOrCreateSecret(handle.db, 'session'))
  const linkSecret = await getOrCreateSecret(handle.db, 'links')

  const fakeSmtp = config.smtpUrl ? null : await startFakeSmtp(handle.db, config.fakeSmtpPort)
  const transport = createMailTransport({ smtpUrl: config.smtpUrl, fakePort: fakeSmtp?.port })
  const dispatcher = startMailDispatcher(handle.db, transport, { from: config.mailFrom })
  const jobs = await JobQueue.start(databaseUrl)

  let boundUrl = config.publicUrl ?? `http://${config.host}:${config.port}`
  const ctx: ServiceContext = {
    db: handle.db,
    config,
    mail: new MailService(handle.db, dispatcher, !!fakeSmtp),
    linkSecret,
    publicUrl: () => config.publicUrl ?? boundUrl,
    jobs,
  }
  const { app } = createApp(ctx, { pool: handle.pool, sessionSecret, clientDir: opts.clientDir === undefined ? DEFAULT_CLIENT_DIR : opts.clientDir })

  let server: Server | null = null
  const closers: (() => Promise<void> | void)[] = []
  return {
    handle, ctx, fakeSmtp, dispatcher, app,
    onClose: (fn) => closers.push(fn),
    listen: (port = config.port, host = config.host) =>
      new Promise((resolve, reject) => {
        server = app.listen(port, host, (err?: Error) => {
          if (err) return reject(err)
          const a = server!.address() as AddressInfo
          boundUrl = `http://${host}:${a.port}`
          resolve(boundUrl)
        })
        server.on('error', reject)
      }),
    close: async () => {
      for (const fn of closers.reverse()) await fn()
      await new Promise<void>((r) => (server ? server.close(() => r()) : r()))
      server?.closeAllConnections?.()
      await jobs.stop()
      await dispatcher.stop()
      await fakeSmtp?.close()
      transport.close()
      await handle.close()
    },
  }
}
