import { randomUUID } from 'node:crypto'
import { mkdirSync, writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { tables, useTestDb } from './db'
import { todayIn } from './due'
import type { Example } from './route-examples'

// The audit-pack routes' examples for the role × route matrix (merged into ROUTE_EXAMPLES).

const rootDir = fileURLToPath(new URL('../..', import.meta.url))

/** A finished audit pack of the caller's at the world's site, its PDF and ZIP where the server keeps job files. */
async function finishedPack(userId: string, siteId: string): Promise<string> {
  const id = randomUUID()
  await useTestDb().insert(tables.backgroundJobs).values({ id, kind: 'audit-pack', siteId, userId, status: 'done', done: 7, total: 7, result: { pages: 1 }, finishedAt: new Date() })
  mkdirSync(`${rootDir}.data/uploads/jobs`, { recursive: true })
  writeFileSync(`${rootDir}.data/uploads/jobs/${id}`, Buffer.from('%PDF-1.4\n%%EOF\n'))
  writeFileSync(`${rootDir}.data/uploads/jobs/${id}-zip`, Buffer.from('PK\u0005\u0006\0\0\0\0\0\0\0\0\0\0\0\0\0\0\0\0'))
  return id
}

export const AUDIT_PACK_EXAMPLES: Record<string, Example> = {
  'server/api/audit-packs/index.post.ts': { ok: [202], run: x => () => x.c.post('/api/audit-packs', { siteId: x.w.siteId, from: todayIn(), to: todayIn() }) },
  'server/api/audit-packs/[id]/[file].get.ts': {
    run: async (x) => {
      const id = x.caller.user ? await finishedPack(x.caller.user.id, x.w.siteId) : randomUUID()
      return () => x.c.get(`/api/audit-packs/${id}/zip`)
    },
  },
}
