import type { AssetKind } from '#shared/utils/asset-schemas'

interface ImportReply { dryRun: boolean, total: number, valid?: number, errors: { line: number, field: string, message: string }[], job?: string }

// CSV import: a dry run first (every bad row with its line), then the all-or-nothing import as a job.
export function useAssetImport(kind: AssetKind) {
  const view = ASSET_VIEWS[kind]
  const session = useSessionStore()
  const report = ref<ImportReply | null>(null)
  const { progress, problem, follow } = useJob(400)
  const { t } = useNuxtApp().$i18n
  const { number } = useLocaleFormat()

  async function check(csv: string) {
    problem.value = ''
    progress.value = null
    try {
      report.value = await $fetch<ImportReply>(`${view.api}/import`, { method: 'POST', body: { siteId: session.siteId, csv, dryRun: true } })
    }
    catch (error) {
      problem.value = errorMessage(error)
    }
  }

  async function run(csv: string) {
    problem.value = ''
    try {
      const reply = await $fetch<ImportReply>(`${view.api}/import`, { method: 'POST', body: { siteId: session.siteId, csv, dryRun: false } })
      report.value = reply
      if (!reply.job) return
      if (await follow(reply.job, reply.total, () => t('asset_form.import.failed'))) {
        await refreshNuxtData(`${kind}-list`)
        useToast().show(t('asset_form.import.imported', { n: number(reply.total) }))
      }
    }
    catch (error) {
      problem.value = errorMessage(error)
    }
  }

  return { report, progress, problem, check, run }
}
