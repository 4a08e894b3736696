import type { Role } from './auth'
import type { ObligationState } from '../utils/due-dates'
import type { DueKind, DueSubject } from '../utils/due-schedules'

// The due list as the API answers it (server/utils/due/list.ts) and the client reads it (app/stores/due.ts).

export interface DueItem {
  id: string
  kind: DueKind
  /** the lead-added schedule it comes from (kind 'custom'), for "Record it done" */
  scheduleId: string | null
  what: string
  subject: DueSubject
  areaName: string | null
  personId: string | null
  dueOn: string | null
  state: ObligationState
  lastDoneOn: string | null
  /** for count rules: charges or hours left (0 or below: due) */
  remaining: number | null
  detail: string | null
  /** the detail as a code and its values (due.detail.<code>), for the reader's language */
  detailWords: { code: string, params?: Record<string, string | number> } | null
  responsibleRole: Role
  action: { label: string, to: string }
}

/** One kind of obligation in the list: how many in each state; the list's groups come worst state first. */
export interface DueGroup {
  /** the kind, or `custom:<schedule id>` for a lead-added schedule */
  key: string
  kind: DueKind
  /** the lead-added schedule the group is (null for a built-in kind) */
  scheduleId: string | null
  label: string
  counts: Record<ObligationState, number>
  worst: ObligationState
  total: number
}

export interface DueListReply {
  site: { id: string, name: string, timeZone: string }
  today: string
  items: DueItem[]
  counts: Record<ObligationState, number>
  /** every obligation of the filter grouped by kind (not only the page's), worst state first */
  groups: DueGroup[]
  /** the site's active schedules a lead added whose responsible role the list covers, by title (the Task filter offers each) */
  schedules: { id: string, title: string }[]
  total: number
  meta: { queries: number, ms: number }
}
