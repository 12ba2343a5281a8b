import { execFileSync } from 'node:child_process'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import { loadConfig } from './config'
import { startRuntime } from './runtime'
import { DEMO_ACCOUNTS } from './seed/demo-accounts'
import { seedDemo } from './seed/demo'

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..')

/** Starts the project-local PostgreSQL cluster and returns its URL (the script prints it last). */
function localDatabase(): string {
  try {
    const out = execFileSync('bash', [path.join(root, 'server/cli/pg.sh'), 'start', process.env.DW_DB_NAME || 'driftwarden'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'] })
    return out.trim().split('\n').pop()!
  } catch {
    console.error('Could not start the local PostgreSQL cluster (see the message above). Set DATABASE_URL to use an existing server.')
    process.exit(1)
  }
}

async function main() {
  const config = loadConfig()
  const url = config.databaseUrl ?? localDatabase()
  const rt = await startRuntime(config, url)
  if (config.seedDemo) await seedDemo(rt.ctx.db, config)
  const { startBackground } = await import('./background')
  await startBackground(rt)
  const bound = await rt.listen().catch((e: NodeJS.ErrnoException) => {
    console.error(e.code === 'EADDRINUSE' ? `Port ${config.port} is in use; set PORT to another one.` : e.message)
    process.exit(1)
  })
  console.log(`\nDriftwarden is running at ${bound}`)
  if (rt.fakeSmtp) console.log(`Local fake SMTP server on 127.0.0.1:${rt.fakeSmtp.port}; mail is shown to admins under Outbox.`)
  if (config.seedDemo) console.log(`Demo sign-in: ${DEMO_ACCOUNTS.map((a) => `${a.email} / ${a.password}`).join(',  ')}`)

  let closing = false
  const stop = async () => {
    if (closing) return
    closing = true
    await rt.close()
    process.exit(0)
  }
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
}

main().catch((e) => {
  console.error('Driftwarden failed to start:', e instanceof Error ? e.message : e)
  process.exit(1)
})
