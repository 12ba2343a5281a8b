import { execFileSync } from 'node:child_process'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import { openDatabase } from '../db/database'
import { makeMigrator } from '../db/migrator'

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..')
const direction = process.argv[2]
if (direction !== 'up' && direction !== 'down') {
  console.error('usage: migrate.ts up|down')
  process.exit(2)
}
const url =
  process.env.DATABASE_URL ??
  execFileSync('bash', [path.join(root, 'server/cli/pg.sh'), 'start', 'driftwarden'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'] }).trim().split('\n').pop()!
const { db, close } = openDatabase(url)
const migrator = makeMigrator(db)
const { error, results } = direction === 'up' ? await migrator.migrateToLatest() : await migrator.migrateDown()
for (const r of results ?? []) console.log(`${r.status === 'Success' ? 'ok ' : 'ERR'} ${r.direction} ${r.migrationName}`)
if (!results?.length) console.log(direction === 'up' ? 'Already at the latest migration.' : 'Nothing to roll back.')
await close()
if (error) {
  console.error('Migration failed:', error instanceof Error ? error.message : error)
  process.exit(1)
}
