// Applies the committed Drizzle migrations (server/database/migrations) to NUXT_DATABASE_URL.
// Plain Node, no devDependencies; an advisory lock keeps two app servers from migrating at once.
// Then installs or upgrades the job queue's own schema (pg-boss, schema `pgboss`; it takes its own lock).
import postgres from 'postgres'
import PgBoss from 'pg-boss'
import { drizzle } from 'drizzle-orm/postgres-js'
import { migrate } from 'drizzle-orm/postgres-js/migrator'
import { fileURLToPath } from 'node:url'

const url = process.env.NUXT_DATABASE_URL ?? 'postgres://bayward@127.0.0.1:54329/bayward'
const folder = fileURLToPath(new URL('../server/database/migrations', import.meta.url))
const sql = postgres(url, { max: 1, onnotice: () => {} })
try {
  await sql`SELECT pg_advisory_lock(725461)`
  await migrate(drizzle(sql), { migrationsFolder: folder })
  await sql`SELECT pg_advisory_unlock(725461)`
  const queue = new PgBoss({ connectionString: url, schema: 'pgboss', max: 1, supervise: false, schedule: false })
  await queue.start()
  await queue.stop({ graceful: false })
  console.log(`migrations applied to ${new URL(url).pathname.slice(1)}`)
}
catch (error) {
  console.error('migration failed:', error instanceof Error ? error.message : error)
  process.exitCode = 1
}
finally {
  await sql.end()
}
