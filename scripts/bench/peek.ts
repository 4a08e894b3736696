// `npx tsx scripts/bench/peek.ts <path>`: one answer of the bench server as the lead sees it (size and a sample).
import { fileURLToPath } from 'node:url'
import { startServer } from './server'
import { BENCH, benchDatabaseUrl, benchId } from './shape'

const root = fileURLToPath(new URL('../..', import.meta.url))
const server = await startServer(root, '.output', benchDatabaseUrl(), { BAYWARD_READ_CACHE: 'false' })
try {
  const lead = await server.signIn(BENCH.leadEmail)
  const path = (process.argv[2] ?? '/api/battery-room/board?siteId=SITE1&areaId=AREA11').replace('SITE1', benchId('site:1')).replace('AREA11', benchId('area:1:1'))
  const res = await fetch(server.base + path, { headers: { cookie: lead, accept: 'application/json' } })
  const text = await res.text()
  console.log(res.status, text.length, 'bytes')
  console.log(text.slice(0, Number(process.env.PEEK_CHARS ?? 3000)))
}
finally {
  await server.stop()
}
