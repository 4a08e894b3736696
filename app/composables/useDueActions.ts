import type { z } from 'zod'
import type { logEntriesSchema } from '#shared/utils/area-checklists'
import type { incidentCreateSchema } from '#shared/utils/incidents'
import type { IncidentAnswer, LogEntriesAnswer } from '#shared/types/floor'
import type { FloorOutcome, FloorRecordWords } from '~/composables/useFloorForm'

// Area logs, follow-ups, incidents, calendar feeds: $fetch → toast → refresh the views and the due list.
export function useDueActions() {
  const toast = useToast()
  const i18n = useNuxtApp().$i18n
  const session = useSessionStore()
  const { submitFloorRecord } = useFloorSubmit()
  const logKeys = ['area-log', 'area-log-followups']

  async function done(keys: string[], message: string, tone?: 'safe' | 'danger') {
    await Promise.all([refreshNuxtData(keys), refreshDue()])
    toast.show(message, tone)
  }

  // through the device outbox: kept on the device when the connection drops
  async function recordLog(body: z.input<typeof logEntriesSchema> & { idempotencyKey: string }, words: FloorRecordWords): Promise<FloorOutcome<LogEntriesAnswer>> {
    const outcome = await submitFloorRecord<LogEntriesAnswer>({ kind: 'log_entries', url: '/api/logs/entries', body, atField: null, ...words })
    if (outcome.state === 'kept') return outcome
    const failed = outcome.data.followUps.length
    await done(logKeys, failed ? i18n.t('toast.checklist_failed_items', { n: failed }, failed) : i18n.t('toast.checklist_saved'), failed ? 'danger' : 'safe')
    return outcome
  }

  async function correctEntry(entryId: string, body: { result: string, note: string, reason: string }) {
    const result = await $fetch(`/api/logs/entries/${entryId}/corrections`, { method: 'POST', body })
    await done(logKeys, i18n.t('toast.correction_added'))
    return result
  }

  async function signLogs(body: { areaId: string, date: string, span: 'day' | 'week', note?: string }) {
    const result = await $fetch<{ signed: unknown[] }>('/api/logs/sign', { method: 'POST', body: { ...body, siteId: session.siteId } })
    await done(logKeys, i18n.t('toast.logs_signed', { n: result.signed.length }, result.signed.length), 'safe')
    return result
  }

  async function closeFollowUp(id: string, note: string) {
    await $fetch(`/api/follow-ups/${id}/close`, { method: 'POST', body: { note } })
    await done(logKeys, i18n.t('toast.follow_up_closed'), 'safe')
  }

  async function saveTemplate(body: Record<string, unknown>) {
    const result = await $fetch<{ item: { version: number } }>('/api/logs/templates', { method: 'POST', body: { ...body, siteId: session.siteId } })
    await done(['log-templates'], i18n.t('toast.template_saved', { version: result.item.version }))
    return result.item
  }

  async function uploadPhoto(file: File) {
    const form = new FormData()
    form.append('file', file, file.name)
    return (await $fetch<{ item: { id: string, displayName: string } }>('/api/uploads', { method: 'POST', query: { siteId: session.siteId }, body: form })).item
  }

  async function reportIncident(body: z.input<typeof incidentCreateSchema>) {
    const result = await $fetch<IncidentAnswer>('/api/incidents', { method: 'POST', body })
    await done(['incidents'], i18n.t('toast.incident_reported', { n: result.alerted }, result.alerted), 'safe')
    return result
  }

  async function createFeed() {
    const result = await $fetch<{ item: { id: string, url: string } }>('/api/calendar/feeds', { method: 'POST' })
    await refreshNuxtData('calendar-feeds')
    return result.item
  }

  async function revokeFeed(id: string) {
    await $fetch(`/api/calendar/feeds/${id}`, { method: 'DELETE' })
    await refreshNuxtData('calendar-feeds')
    toast.show(i18n.t('toast.feed_revoked'))
  }

  return { recordLog, correctEntry, signLogs, closeFollowUp, saveTemplate, uploadPhoto, reportIncident, createFeed, revokeFeed }
}
