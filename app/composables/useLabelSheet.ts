import type { LabelSelection } from '#shared/utils/label-schemas'

export interface LabelPreviewItem { kind: AssetKind, id: string, code: string, title: string, identity: string }

// Label sheet flow: preview the selection, then make the PDF as a job and follow its progress.
export function useLabelSheet() {
  const { progress, problem, run } = useJob(400)
  const pdfUrl = ref<string | null>(null)
  const { t } = useNuxtApp().$i18n

  async function preview(selection: LabelSelection) {
    return $fetch<{ items: LabelPreviewItem[], total: number }>('/api/labels/preview', { method: 'POST', body: selection })
  }

  async function makePdf(selection: LabelSelection) {
    pdfUrl.value = null
    const id = await run('/api/labels', { ...selection }, () => t('labels.failed'))
    if (id) pdfUrl.value = `/api/labels/${id}/pdf`
  }

  return { progress, pdfUrl, problem, preview, makePdf }
}
