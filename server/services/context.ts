import type { Config } from '../config'
import type { Db } from '../db/database'
import type { JobQueue } from '../jobs/queue'
import type { MailService } from './mail.service'

/** What services need from the running process, passed explicitly instead of read from globals. */
export interface ServiceContext {
  db: Db
  config: Config
  mail: MailService
  /** HMAC secret for e-mailed links. */
  linkSecret: string
  /** Base URL for links in e-mails, e.g. http://127.0.0.1:3000 */
  publicUrl: () => string
  /** The pg-boss job queue shared by simulations and scheduled notices. */
  jobs: JobQueue
}

/** What a background worker started from `BACKGROUND` needs of the runtime (which satisfies it), without importing it. */
export interface BackgroundHost {
  ctx: ServiceContext
  /** Closed in reverse order when the runtime stops. */
  onClose(fn: () => Promise<void> | void): void
}
