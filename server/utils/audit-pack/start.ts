import type { AuditPackRequest } from '#shared/utils/audit-pack'
import { parseSiteSettings } from '#shared/utils/site-settings'
import type { Language } from '#shared/utils/languages'
import { PACK_SECTIONS } from './sections'
import { auditPackJob, readAuditZip } from './job'

// Starting an audit pack and handing out its files: services called by the routes with (actor, input).

/** Queues the pack of a site and range; the caller has been checked for `audit-pack.make` at the site. */
export async function startAuditPack(actor: Actor, input: AuditPackRequest, language: Language) {
  const [site] = await useDb().select({ name: tables.sites.name, timeZone: tables.sites.timeZone, settings: tables.sites.settings })
    .from(tables.sites).where(eq(tables.sites.id, input.siteId))
  if (!site) throw codedError(404, 'no_such_site', 'No such site.')
  return auditPackJob.start({ siteId: input.siteId, userId: actor.user.id }, PACK_SECTIONS.length, {
    siteId: input.siteId, from: input.from, to: input.to, siteName: site.name, timeZone: site.timeZone,
    siteLimitPpm: parseSiteSettings(site.settings).coSiteLimitPpm, madeBy: actor.user.name, language,
  })
}

/** A finished pack of the caller's: its PDF or its ZIP, with a file name naming the site's range. */
export async function auditPackFile(actor: Actor, jobId: string, file: 'pdf' | 'zip', check: (siteId: string) => Promise<unknown>) {
  const job = await readJob<{ pages: number }>(jobId, actor.user.id)
  if (job.kind !== 'audit-pack') throw codedError(404, 'no_such_audit_pack', 'No such audit pack.')
  await check(job.siteId)
  if (job.status !== 'done') throw job.status === 'failed' ? codedError(409, 'audit_pack_failed', job.message ?? 'The pack failed.') : codedError(409, 'audit_pack_not_ready', 'The pack is not ready yet.')
  const bytes = file === 'pdf' ? await readJobFile(jobId) : await readAuditZip(jobId)
  if (!bytes) throw codedError(404, 'audit_pack_expired', 'The pack has expired; make it again.')
  return { bytes, name: `bayward-audit-pack-${job.createdAt.slice(0, 10)}.${file}` }
}
