// Admin flows for people: add, roles, deactivate, password links, training records.
export function usePeopleActions() {
  const toast = useToast()
  const i18n = useNuxtApp().$i18n
  const refresh = () => refreshNuxtData('people')

  async function addPerson(body: Record<string, unknown>) {
    await $fetch('/api/users', { method: 'POST', body })
    await refresh()
    toast.show(i18n.t('toast.person_added'))
  }
  async function setRoles(userId: string, siteId: string, roles: string[]) {
    await $fetch(`/api/users/${userId}/roles`, { method: 'PUT', body: { siteId, roles } })
    await refresh()
    toast.show(i18n.t('toast.roles_saved'))
  }
  async function setActive(userId: string, active: boolean) {
    await $fetch(`/api/users/${userId}`, { method: 'PATCH', body: { active } })
    await refresh()
    toast.show(i18n.t(active ? 'toast.reactivated' : 'toast.deactivated'))
  }
  async function addQualification(userId: string, body: Record<string, unknown>) {
    await $fetch(`/api/users/${userId}/qualifications`, { method: 'POST', body })
    await refresh()
    toast.show(i18n.t('toast.training_recorded'))
  }
  async function sendPasswordLink(userId: string) {
    const res = await $fetch<{ email: string }>(`/api/users/${userId}/password-link`, { method: 'POST' })
    toast.show(i18n.t('toast.password_link_sent', { email: res.email }))
  }
  return { addPerson, setRoles, setActive, addQualification, sendPasswordLink }
}
