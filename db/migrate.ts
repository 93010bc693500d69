import { promises as fs } from "node:fs"
import path from "node:path"
import { FileMigrationProvider, Migrator } from "kysely"
import { createDb } from "./client"

export async function migrateToLatest(connectionString?: string) {
  const db = createDb(connectionString)
  const migrator = new Migrator({
    db,
    provider: new FileMigrationProvider({ fs, path, migrationFolder: path.join(import.meta.dirname, "migrations") }),
  })
  const { error, results } = await migrator.migrateToLatest()
  for (const r of results ?? []) {
    if (r.status === "Success") console.log(`[straightaway] migration ${r.migrationName} applied`)
    if (r.status === "Error") console.error(`[straightaway] migration ${r.migrationName} failed`)
  }
  await db.destroy()
  if (error) throw error
}

if (import.meta.url === `file://${process.argv[1]}`) {
  migrateToLatest().catch((error) => {
    console.error(error)
    process.exit(1)
  })
}
