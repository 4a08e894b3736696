import type { AuditPackRequest } from '#shared/utils/audit-pack'

export interface AuditPackProgress { done: number, total: number, status: 'running' | 'done' | 'failed', message?: string | null }

// Audit pack flow: start the job, follow its progress, then offer the PDF and the ZIP.
export function useAuditPack() {
  const progress = ref<AuditPackProgress | null>(null)
  const files = ref<{ pdf: string, zip: string } | null>(null)
  const problem = ref('')

  async function make(request: AuditPackRequest) {
    problem.value = ''
    files.value = null
    try {
      const job = await $fetch<{ id: string, total: number }>('/api/audit-packs', { method: 'POST', body: request })
      progress.value = { done: 0, total: job.total, status: 'running' }
      while (progress.value.status === 'running') {
        await new Promise(r => setTimeout(r, 600))
        progress.value = await $fetch<AuditPackProgress>(`/api/jobs/${job.id}`)
      }
      if (progress.value.status === 'done') files.value = { pdf: `/api/audit-packs/${job.id}/pdf`, zip: `/api/audit-packs/${job.id}/zip` }
      else problem.value = progress.value.message ?? ''
    }
    catch (error) {
      problem.value = errorMessage(error)
      progress.value = null
    }
  }

  return { progress, files, problem, make }
}
