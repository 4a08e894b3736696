import type { LabelSelection } from '#shared/utils/label-schemas'

export interface LabelPreviewItem { kind: AssetKind, id: string, code: string, title: string, identity: string }

// Label sheet flow: preview the selection, then make the PDF as a job and follow its progress.
export function useLabelSheet() {
  const progress = ref<{ done: number, total: number, status: string } | null>(null)
  const pdfUrl = ref<string | null>(null)
  const problem = ref('')

  async function preview(selection: LabelSelection) {
    return $fetch<{ items: LabelPreviewItem[], total: number }>('/api/labels/preview', { method: 'POST', body: selection })
  }

  async function makePdf(selection: LabelSelection) {
    problem.value = ''
    pdfUrl.value = null
    try {
      const job = await $fetch<{ id: string, total: number }>('/api/labels', { method: 'POST', body: selection })
      progress.value = { done: 0, total: job.total, status: 'running' }
      while (progress.value.status === 'running') {
        await new Promise(r => setTimeout(r, 400))
        progress.value = await $fetch<{ done: number, total: number, status: string }>(`/api/jobs/${job.id}`)
      }
      if (progress.value.status === 'done') pdfUrl.value = `/api/labels/${job.id}/pdf`
      else problem.value = 'The sheet could not be made. Try again.'
    }
    catch (error) {
      problem.value = errorMessage(error)
      progress.value = null
    }
  }

  return { progress, pdfUrl, problem, preview, makePdf }
}
