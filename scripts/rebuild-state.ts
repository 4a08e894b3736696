// `npm run rebuild-state`: recomputes every read model (battery status, truck status, obligations) from
// the records of NUXT_DATABASE_URL. The recovery path; safe to run on a live database (one site per
// transaction). Flags: --if-needed (only when a migration asked for it), --site <id> (one site).
import postgres from 'postgres'
import { drizzle } from 'drizzle-orm/postgres-js'
import * as schema from '../server/database/schema'
import { rebuildReadModels, rebuildReadModelsIfNeeded } from '../server/utils/due/rebuild'

const url = process.env.NUXT_DATABASE_URL ?? 'postgres://bayward@127.0.0.1:54329/bayward'
const args = process.argv.slice(2)
const siteArg = args.includes('--site') ? args[args.indexOf('--site') + 1] : undefined
const client = postgres(url, { max: 2, onnotice: () => {} })
const db = drizzle(client, { schema, casing: 'snake_case' })
const log = (line: string) => console.log(line)

try {
  const report = args.includes('--if-needed')
    ? await rebuildReadModelsIfNeeded(db, log)
    : await rebuildReadModels(db, { siteIds: siteArg ? [siteArg] : undefined, log })
  if (report) console.log(`read models rebuilt: ${report.sites} sites, ${report.batteries} batteries, ${report.trucks} trucks, ${report.obligations} obligations in ${(report.ms / 1000).toFixed(1)} s`)
  else console.log('read models are current')
}
catch (error) {
  console.error('rebuild failed:', error instanceof Error ? error.message : error)
  process.exitCode = 1
}
finally {
  await client.end({ timeout: 5 })
}
