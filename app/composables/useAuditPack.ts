import type { AuditPackRequest } from '#shared/utils/audit-pack'

export type { JobProgress as AuditPackProgress } from './useJob'

// Audit pack flow: start the job, follow its progress, then offer the PDF and the ZIP.
export function useAuditPack() {
  const { progress, problem, run } = useJob(600)
  const { t, locale } = useNuxtApp().$i18n
  const files = ref<{ pdf: string, zip: string } | null>(null)

  async function make(request: AuditPackRequest) {
    files.value = null
    // the job's own words are English: another language says it failed in its own words
    const id = await run('/api/audit-packs', { ...request }, p => (locale.value === 'en' && p.message ? p.message : t('audit_pack.failed')))
    if (id) files.value = { pdf: `/api/audit-packs/${id}/pdf`, zip: `/api/audit-packs/${id}/zip` }
  }

  return { progress, files, problem, make }
}
