interface SiteRow {
  id: string
  name: string
  address: string
  timeZone: string
  unitSystem: 'us' | 'metric'
  settings: SiteSettings
  roles: string[]
  areas: { id: string, name: string, kind: 'charging_area' | 'fuel_station' }[]
}

// The user's sites with their areas and settings (one cached request).
export function useSites() {
  const session = useSessionStore()
  const result = useFetch<{ items: SiteRow[] }>('/api/sites', { key: 'sites' })
  const current = computed(() => result.data.value?.items.find(s => s.id === session.siteId) ?? null)
  const areas = computed(() => current.value?.areas ?? [])
  /** resolves once the sites are here (a form filled from them on the server awaits it before it renders) */
  const loaded = async () => {
    await result
  }
  return { ...result, current, areas, loaded }
}
