import type { H3Event } from 'h3'
import { z } from 'zod'
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import type { AssetKind } from '#shared/utils/asset-schemas'

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
  const actor = await requireAbility(event, 'asset.edit', body.siteId)
  const { byName } = await areaNames(body.siteId)
  const { rows, errors, total } = parseAssetCsv(kind, body.csv, byName)
  // the rules of create apply to every row (area kinds, statuses)
  const areaKinds = await siteAreaKinds(body.siteId)
  for (const r of rows) {
    for (const [field, message] of Object.entries(assetRuleProblems(kind, r, areaKinds))) errors.push({ line: r._line as number, field, message })
  }
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
  const job = await assetImportJob.start({ siteId: body.siteId, userId: actor.user.id }, rows.length, { kind, rows })
  setResponseStatus(event, 202)
  return { dryRun: false, job: job.id, total: rows.length, errors: [] }
}

export interface AssetImportInput { kind: AssetKind, rows: Record<string, unknown>[] }

// The import job: every row, its tag and its audit entry in one transaction that also ends the job, so
// the rows count exactly when the job says done (a run started again after a lost worker finds it ended).
export const assetImportJob = defineJob('import', async ({ kind, rows }: AssetImportInput, run) => {
  const cfg = assetKinds()[kind]
  const { siteId, userId } = run.owner
  const actor = { user: { id: userId } }
  await useDb().transaction(async (tx) => {
    const createdIds: string[] = []
    for (const [i, { _line, ...values }] of rows.entries()) {
      const [row] = await tx.insert(cfg.table).values({ ...values, siteId } as never).returning()
      const created = row as Record<string, unknown> & { id: string }
      await issueTag(tx, kind, created.id, siteId)
      await writeAudit(tx, { actor, siteId, action: 'import', entity: kind, entityId: created.id, after: created, note: `CSV line ${_line}` })
      createdIds.push(created.id)
      if (i % 25 === 24) await run.progress(i + 1)
    }
    // the new assets' read models (status rows, obligations) in the same transaction
    const subjects = kind === 'truck' || kind === 'area'
      ? (await Promise.all(createdIds.map(id => registrySubjects(tx, kind, { id, siteId })))).flat()
      : createdIds.map(id => ({ kind, id }))
    await recomputeSubjects(tx, siteId, subjects)
    await run.finishIn(tx, { imported: rows.length })
  })
  return { imported: rows.length }
})
