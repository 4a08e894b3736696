import { execFileSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import postgres from 'postgres'

const root = fileURLToPath(new URL('../..', import.meta.url))

// Refuses anything but a `_test` database, applies the migrations and empties every application
// table (and the job queue) once per run, then checks that the built server the e2e files start is there.
export default async function prepareTestDatabase() {
  const url = process.env.NUXT_DATABASE_URL
  if (!url) throw new Error('NUXT_DATABASE_URL is not set. Run `npm test`, or set it to postgres://bayward@127.0.0.1:54329/bayward_test.')
  const database = new URL(url).pathname.replace(/^\//, '')
  if (!database.endsWith('_test')) {
    throw new Error(`NUXT_DATABASE_URL points at "${database}"; the end-to-end tests empty their database, so its name must end in "_test".`)
  }
  if ((process.env.NUXT_SESSION_PASSWORD ?? '').length < 32) {
    throw new Error('NUXT_SESSION_PASSWORD must be set (at least 32 characters) for the server under test.')
  }
  const outputDir = process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output'
  if (!existsSync(`${root}${outputDir}/server/index.mjs`)) {
    throw new Error(`No built server at ${outputDir}/server/index.mjs. Run \`npx nuxt build\` first (\`npm test\` does).`)
  }
  // Both the e2e and browser projects list this file; the database is emptied only once per run.
  if (process.env.BAYWARD_TEST_DB_PREPARED === database) return

  const sql = postgres(url, { max: 1, onnotice: () => {} })
  try {
    // the job queue's schema goes too; migrate.mjs puts it back empty
    await sql`DROP SCHEMA IF EXISTS pgboss CASCADE`
    execFileSync('node', ['scripts/migrate.mjs'], { cwd: root, env: process.env, stdio: 'inherit' })
    const rows = await sql<{ name: string }[]>`
      SELECT quote_ident(tablename) AS name FROM pg_tables
      WHERE schemaname = 'public' AND tablename NOT LIKE '%drizzle_migrations'`
    if (rows.length) await sql.unsafe(`TRUNCATE ${rows.map(r => r.name).join(', ')} RESTART IDENTITY CASCADE`)
  }
  finally {
    await sql.end()
  }
  process.env.BAYWARD_TEST_DB_PREPARED = database
}
