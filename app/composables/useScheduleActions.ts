import type { ScheduleDefinition } from '#shared/utils/due-schedules'

// The Schedules page and "Record it done": $fetch → toast → refresh the schedules and every open due list.
export function useScheduleActions() {
  const toast = useToast()
  const i18n = useNuxtApp().$i18n
  const session = useSessionStore()

  async function addSchedule(body: Record<string, unknown>) {
    const { item } = await $fetch<{ item: ScheduleDefinition }>('/api/schedules/custom', { method: 'POST', body: { ...body, siteId: session.siteId } })
    await Promise.all([refreshNuxtData('schedules'), refreshDue()])
    toast.show(i18n.t('toast.schedule_added', { title: item.title }), 'safe')
    return item
  }

  async function updateCustomSchedule(id: string, body: Record<string, unknown>) {
    const { item } = await $fetch<{ item: ScheduleDefinition }>(`/api/schedules/custom/${id}`, { method: 'PATCH', body: { ...body, siteId: session.siteId } })
    await refreshDue()
    return item
  }

  async function recordDone(scheduleId: string, body: Record<string, unknown>) {
    const result = await $fetch<{ item: { id: string } }>(`/api/schedules/custom/${scheduleId}/completions`, { method: 'POST', body })
    await Promise.all([refreshNuxtData(`schedule-${scheduleId}`), refreshDue()])
    toast.show(i18n.t('toast.schedule_done'), 'safe')
    return result.item
  }

  return { addSchedule, updateCustomSchedule, recordDone }
}
