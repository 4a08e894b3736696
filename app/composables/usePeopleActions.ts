// Admin flows for people: add, roles, deactivate, password links, training records.
export function usePeopleActions() {
  const toast = useToast()
  const refresh = () => refreshNuxtData('people')

  async function addPerson(body: Record<string, unknown>) {
    await $fetch('/api/users', { method: 'POST', body })
    await refresh()
    toast.show('Person added.')
  }
  async function setRoles(userId: string, siteId: string, roles: string[]) {
    await $fetch(`/api/users/${userId}/roles`, { method: 'PUT', body: { siteId, roles } })
    await refresh()
    toast.show('Roles saved.')
  }
  async function setActive(userId: string, active: boolean) {
    await $fetch(`/api/users/${userId}`, { method: 'PATCH', body: { active } })
    await refresh()
    toast.show(active ? 'Reactivated.' : 'Deactivated; their sessions end now.')
  }
  async function addQualification(userId: string, body: Record<string, unknown>) {
    await $fetch(`/api/users/${userId}/qualifications`, { method: 'POST', body })
    await refresh()
    toast.show('Training recorded.')
  }
  async function sendPasswordLink(userId: string) {
    const res = await $fetch<{ message: string }>(`/api/users/${userId}/password-link`, { method: 'POST' })
    toast.show(res.message)
  }
  return { addPerson, setRoles, setActive, addQualification, sendPasswordLink }
}
