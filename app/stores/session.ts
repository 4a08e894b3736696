import { defineStore } from 'pinia'
import { del, get, set } from 'idb-keyval'
import { ROLES, type Role, type SiteMembership } from '#shared/types/auth'
import { can as holds, type Ability } from '#shared/utils/abilities'
import type { UnitSystem } from '#shared/utils/units'
import type { Language } from '#shared/utils/languages'

interface MeResponse {
  // language is absent in a copy kept on the device before languages existed
  user: { id: string, email: string, name: string, language?: Language | null }
  memberships: SiteMembership[]
  sites: { id: string, name: string, timeZone: string, unitSystem: UnitSystem }[]
}

// Who is signed in, where (the current site), and what they may do there.
export const useSessionStore = defineStore('session', () => {
  const me = ref<MeResponse | null>(null)
  const siteCookie = useCookie<string | null>('bayward-site', { sameSite: 'lax', maxAge: 60 * 60 * 24 * 365 })

  const signedIn = computed(() => me.value !== null)
  const sites = computed(() => me.value?.sites.slice().sort((a, b) => a.name.localeCompare(b.name)) ?? [])
  const homeSiteId = computed(() => me.value?.memberships[0]?.siteId)
  const currentSite = computed(() => sites.value.find(s => s.id === siteCookie.value) ?? sites.value.find(s => s.id === homeSiteId.value) ?? sites.value[0] ?? null)
  const siteId = computed(() => currentSite.value?.id ?? null)
  const roles = computed<Role[]>(() => me.value?.memberships.find(m => m.siteId === siteId.value)?.roles ?? [])
  const units = computed<UnitSystem>(() => currentSite.value?.unitSystem ?? 'us')
  // the highest role held here, for the header's label (ROLES runs lowest to highest)
  const primaryRole = computed<Role | null>(() => [...ROLES].reverse().find(r => roles.value.includes(r)) ?? null)

  /** Whether the user holds the ability at the current site (the one permissions map, shared/utils/abilities.ts). */
  function can(ability: Ability) {
    return holds(roles.value, ability)
  }

  /** The same at another of the user's sites. */
  function canAt(siteId: string, ability: Ability) {
    return holds(me.value?.memberships.find(m => m.siteId === siteId)?.roles ?? [], ability)
  }

  // With no signal at all, the app opened from the service worker still knows who was signed in on this
  // device (kept in IndexedDB at the last answer); a 401 or a sign-out forgets it.
  async function load() {
    try {
      me.value = await useRequestFetch()<MeResponse>('/api/me')
    }
    catch (error) {
      const offline = import.meta.client && !parseRefusal(error)
      me.value = offline ? (await get<MeResponse>('me', deviceDb()).catch(() => undefined)) ?? null : null
      if (import.meta.client && !offline) await del('me', deviceDb()).catch(() => undefined)
    }
  }

  // whoever is signed in (from the server's page or a later answer) is kept on the device for the next start
  if (import.meta.client) {
    watch(me, (value) => {
      if (value) set('me', JSON.parse(JSON.stringify(value)), deviceDb()).catch(() => undefined)
    }, { immediate: true })
  }

  /** Saves the person's language (null: follow the browser) and shows the app in it. */
  async function chooseLanguage(language: Language | null) {
    await $fetch('/api/me/language', { method: 'PUT', body: { language } })
    if (me.value) me.value = { ...me.value, user: { ...me.value.user, language } }
  }

  function chooseSite(id: string) {
    siteCookie.value = id
  }

  async function signOut() {
    await $fetch('/api/auth/sign-out', { method: 'POST' })
    me.value = null
    await del('me', deviceDb()).catch(() => undefined)
  }

  return { me, signedIn, sites, currentSite, siteId, roles, units, primaryRole, can, canAt, load, chooseSite, chooseLanguage, signOut }
})
