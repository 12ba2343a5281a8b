import { DEFAULT_CLIENT_DIR } from '../../server/app'
import { startTestRuntime } from './test-runtime'
import type { Runtime } from '../../server/runtime'

/** The built client (dist/) plus the API on a free loopback port, with background workers, for browser tests. */
export async function startTestServer(): Promise<{ url: string; rt: Runtime; close(): Promise<void> }> {
  const rt = await startTestRuntime({}, { clientDir: DEFAULT_CLIENT_DIR, background: true })
  const url = await rt.listen(0, '127.0.0.1')
  // Links in e-mails must point at this server.
  rt.ctx.config.publicUrl = url
  return { url, rt, close: () => rt.close() }
}
