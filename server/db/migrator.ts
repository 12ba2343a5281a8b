import { promises as fs } from 'node:fs'
import path from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { type Kysely, type Migration, type MigrationProvider, Migrator } from 'kysely'

const migrationFolder = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../migrations')

// Kysely's FileMigrationProvider imports from inside node_modules, which vitest does not transform;
// importing here, in our own module, works under tsx, vitest and plain node alike.
class LocalFileMigrationProvider implements MigrationProvider {
  async getMigrations(): Promise<Record<string, Migration>> {
    const out: Record<string, Migration> = {}
    for (const f of (await fs.readdir(migrationFolder)).sort()) {
      if (!/^\d.*\.(ts|js|mts|mjs)$/.test(f) || /\.d\.m?ts$/.test(f)) continue
      out[f.replace(/\.[mc]?[tj]s$/, '')] = await import(pathToFileURL(path.join(migrationFolder, f)).href)
    }
    return out
  }
}

export function makeMigrator(db: Kysely<any>): Migrator {
  return new Migrator({ db, provider: new LocalFileMigrationProvider(), allowUnorderedMigrations: true })
}

export async function migrateToLatest(db: Kysely<any>): Promise<string[]> {
  const { error, results } = await makeMigrator(db).migrateToLatest()
  if (error) throw error instanceof Error ? error : new Error(String(error))
  return (results ?? []).filter((r) => r.status === 'Success').map((r) => r.migrationName)
}
