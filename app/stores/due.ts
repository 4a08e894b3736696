import { defineStore } from 'pinia'
import type { Role } from '#shared/types/auth'
import type { DueItem, DueListReply } from '#shared/types/due'

export type { DueItem, DueListReply }

export interface DueFilter {
  role?: Role | 'all'
  state?: string
  kind?: string
  /** one lead-added schedule (a group of the due page) */
  schedule?: string
  sort?: 'due' | 'kind' | 'subject' | 'role'
  /** how many obligations to load (the server's page size when absent) */
  limit?: number
}

const keyOf = (siteId: string, filter: DueFilter) => `${siteId}|${filter.role ?? ''}|${filter.state ?? ''}|${filter.kind ?? ''}|${filter.schedule ?? ''}|${filter.sort ?? ''}|${filter.limit ?? ''}`

// The user's due lists, one per site and filter, refreshed after anything is recorded.
export const useDueStore = defineStore('due', () => {
  const lists = ref<Record<string, { siteId: string, filter: DueFilter, reply: DueListReply, loadedAt: number }>>({})
  const loading = ref(false)

  async function load(siteId: string, filter: DueFilter = {}) {
    loading.value = true
    try {
      const reply = await useRequestFetch()<DueListReply>('/api/due', { query: { siteId, ...filter } })
      lists.value[keyOf(siteId, filter)] = { siteId, filter, reply, loadedAt: Date.now() }
      return reply
    }
    finally {
      loading.value = false
    }
  }

  function list(siteId: string | null, filter: DueFilter = {}): DueListReply | null {
    return siteId ? lists.value[keyOf(siteId, filter)]?.reply ?? null : null
  }

  async function refreshAll() {
    await Promise.all(Object.values(lists.value).map(l => load(l.siteId, l.filter).catch(() => null)))
  }

  return { lists, loading, load, list, refreshAll }
})

/** Reloads every due list the user has open; call after recording work that closes an obligation. */
export function refreshDue() {
  return useDueStore().refreshAll()
}
