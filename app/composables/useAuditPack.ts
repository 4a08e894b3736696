import type { AuditPackRequest } from '#shared/utils/audit-pack'

export type { JobProgress as AuditPackProgress } from './useJob'

// Audit pack flow: start the job, follow its progress, then offer the PDF and the ZIP.
export function useAuditPack() {
  const { progress, problem, run } = useJob(600)
  const files = ref<{ pdf: string, zip: string } | null>(null)

  async function make(request: AuditPackRequest) {
    files.value = null
    const id = await run('/api/audit-packs', { ...request }, p => p.message ?? '')
    if (id) files.value = { pdf: `/api/audit-packs/${id}/pdf`, zip: `/api/audit-packs/${id}/zip` }
  }

  return { progress, files, problem, make }
}
