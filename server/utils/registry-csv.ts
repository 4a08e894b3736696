import type { H3Event } from 'h3'
import { z } from 'zod'
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import type { AssetKind } from '#shared/utils/asset-schemas'
import { listQuerySchema } from '#shared/utils/asset-schemas'

// Asset lists as CSV: the export (the list's query without paging) and the import (a dry run, then one
// transaction as a job).

// The whole filtered list as CSV (the same query as the list, without paging).
export async function exportAssets(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const query = validateQuery(event, listQuerySchema)
  await requireSiteRole(event, query.siteId)
  const { condition, order } = listConditions(event, kind, query)
  const rows = await withStatusJoin(cfg, useDb().select({ row: cfg.table, tagCode: liveTagCode(kind, cfg.table), ...cfg.status?.columns })
    .from(cfg.table as PgTable)).where(condition).orderBy(...order).limit(200_000)
  const { byId } = await areaNames(query.siteId)
  const csv = toCsv(kind, (rows as ListRow[]).map(registryListItem), byId)
  return sendCsv(event, `bayward-${kind}-list-${new Date().toISOString().slice(0, 10)}.csv`, csv)
}

const importBody = z.object({
  siteId: z.uuid('Pick a site.'),
  csv: z.string().min(1, 'The file is empty.').max(5_000_000, 'The file is over 5 MB; split it.'),
  dryRun: z.boolean().default(true),
})

// CSV import: a dry run lists every bad row (line and field); a real run writes all rows or none,
// as a job whose progress the client polls.
export async function importAssets(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const body = await validateBody(event, importBody)
  const actor = await requireSiteRole(event, body.siteId, EDITORS)
  const { byName } = await areaNames(body.siteId)
  const { rows, errors, total } = parseAssetCsv(kind, body.csv, byName)
  const identities = rows.map(r => String(r[cfg.identity]).toLowerCase())
  identities.forEach((id, i) => {
    if (identities.indexOf(id) !== i) errors.push({ line: rows[i]!._line as number, field: cfg.identity, message: `"${rows[i]![cfg.identity]}" appears twice in the file.` })
  })
  if (rows.length) {
    const identityCol = (cfg.table as unknown as Record<string, PgColumn>)[cfg.identity]!
    const existing = await useDb().select({ v: identityCol }).from(cfg.table as PgTable)
      .where(and(eq(cfg.table.siteId, body.siteId), inArray(sql`lower(${identityCol})`, identities)))
    const taken = new Set(existing.map(e => String(e.v).toLowerCase()))
    rows.forEach((r) => {
      if (taken.has(String(r[cfg.identity]).toLowerCase())) errors.push({ line: r._line as number, field: cfg.identity, message: `A ${cfg.noun} "${r[cfg.identity]}" already exists at this site.` })
    })
  }
  errors.sort((a, b) => a.line - b.line)
  if (body.dryRun || errors.length) {
    return { dryRun: true, total, valid: errors.length ? rows.length - new Set(errors.map(e => e.line)).size : rows.length, errors }
  }
  const job = await startJob('import', { siteId: body.siteId, userId: actor.user.id }, rows.length, async (progress) => {
    await useDb().transaction(async (tx) => {
      const createdIds: string[] = []
      for (const [i, { _line, ...values }] of rows.entries()) {
        const [row] = await tx.insert(cfg.table).values({ ...values, siteId: body.siteId } as never).returning()
        const created = row as Record<string, unknown> & { id: string }
        await issueTag(tx, kind, created.id, body.siteId)
        await writeAudit(tx, { actor, siteId: body.siteId, action: 'import', entity: kind, entityId: created.id, after: created, note: `CSV line ${_line}` })
        createdIds.push(created.id)
        if (i % 25 === 24) await progress(i + 1)
      }
      const subjects = kind === 'truck' || kind === 'area'
        ? (await Promise.all(createdIds.map(id => registrySubjects(tx, kind, { id, siteId: body.siteId })))).flat()
        : createdIds.map(id => ({ kind, id }))
      await recomputeSubjects(tx, body.siteId, subjects)
    })
    return { imported: rows.length }
  })
  setResponseStatus(event, 202)
  return { dryRun: false, job: job.id, total: rows.length, errors: [] }
}
