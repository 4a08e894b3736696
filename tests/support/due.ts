import { randomUUID } from 'node:crypto'
import { and, eq } from 'drizzle-orm'
import type { Role } from '../../shared/types/auth'
import { area, battery, charger, refreshReadModels, tables, truck, user, useTestDb } from './db'
import { signIn, qs, type Client } from './http'

// Fixtures for the due list, area logs, mail and calendar tests.

export async function person(siteId: string, roles: Role[]): Promise<{ client: Client, id: string, email: string }> {
  const u = await user({ siteId, roles })
  return { client: await signIn(u), id: u.id, email: u.email }
}

export const chargingArea = (siteId: string, over: Record<string, unknown> = {}) => area({ siteId, kind: 'charging_area', ...over })

/** Today's date in a time zone, as the server computes it for a site. */
export function todayIn(timeZone = 'America/Chicago'): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date())
}

export function daysFrom(isoDate: string, days: number): string {
  const d = new Date(`${isoDate}T00:00:00Z`)
  d.setUTCDate(d.getUTCDate() + days)
  return d.toISOString().slice(0, 10)
}

/** Completed charge sessions on a battery, `hoursAgo` apart, the latest first. */
export async function endedCharges(siteId: string, batteryId: string, chargerId: string, userId: string, hoursAgo: number[], equalize = false) {
  const now = Date.now()
  await useTestDb().insert(tables.chargeSessions).values(hoursAgo.map(h => ({
    siteId, userId, batteryId, chargerId, at: new Date(now - (h + 8) * 3_600_000), endedAt: new Date(now - h * 3_600_000), endedBy: userId,
    outcome: 'complete' as const, equalize, ampHoursReturned: 400, endTempF: 95, countedCycle: true,
  })))
  await refreshReadModels(siteId, [{ kind: 'battery', id: batteryId }])
}

/** A flooded battery registered long enough ago that its day caps have passed. */
export async function oldBattery(siteId: string, daysAgo = 60, over: Record<string, unknown> = {}) {
  const b = await battery({ siteId, ...over })
  const createdAt = new Date(Date.now() - daysAgo * 86_400_000)
  await useTestDb().update(tables.batteries).set({ createdAt }).where(eq(tables.batteries.id, b.id))
  await refreshReadModels(siteId, [{ kind: 'battery', id: b.id }])
  return { ...b, createdAt }
}

export async function registeredDaysAgo(table: typeof tables.areas | typeof tables.trucks | typeof tables.chargers, id: string, daysAgo: number) {
  const [row] = await useTestDb().update(table).set({ createdAt: new Date(Date.now() - daysAgo * 86_400_000) }).where(eq(table.id, id)).returning({ siteId: table.siteId })
  const kind = table === tables.areas ? 'area' : table === tables.trucks ? 'truck' : 'charger'
  await refreshReadModels(row!.siteId, [{ kind, id }])
}

export interface DueReply {
  today: string
  items: { id: string, kind: string, subject: { id: string, label: string, tagCode: string | null }, dueOn: string | null, state: string, lastDoneOn: string | null, remaining: number | null, action: { to: string }, responsibleRole: string }[]
  counts: Record<string, number>
  groups: { kind: string, label: string, counts: Record<string, number>, worst: string, total: number }[]
  total: number
  meta: { queries: number, ms: number }
}

export async function dueList(c: Client, params: Record<string, string | number | undefined>) {
  const res = await c.get<DueReply>(`/api/due?${qs(params)}`)
  if (res.status !== 200) throw new Error(`GET /api/due answered ${res.status}: ${JSON.stringify(res.body)}`)
  return res.body
}

export const obligationOf = (list: DueReply, kind: string, subjectId: string) =>
  list.items.find(o => o.kind === kind && o.subject.id === subjectId && o.state !== 'done')

export const allPass = (keys: string[]) => keys.map(itemKey => ({ itemKey, result: 'pass' as const, note: '' }))

export const CHARGING_KEYS = [
  'eyewash_flushed_reachable', 'spill_kit_neutralizer_stocked', 'ppe_stocked', 'ventilation_running', 'no_smoking_signs_posted',
  'extinguisher_present_charged', 'chargers_cables_undamaged', 'no_combustibles_near_chargers', 'battery_handling_equipment_ok', 'floor_clean_dry',
]

export async function mailTo(email: string) {
  return useTestDb().select().from(tables.mailMessages).where(eq(tables.mailMessages.toAddress, email))
}

export async function mailOfKind(siteId: string, kind: string) {
  return useTestDb().select().from(tables.mailMessages).where(and(eq(tables.mailMessages.siteId, siteId), eq(tables.mailMessages.kind, kind)))
}

export { area, battery, charger, truck, randomUUID }

/** Waits until `check` returns a truthy value (the outbox delivers after the response). */
export async function eventually<T>(check: () => Promise<T | undefined | null | false>, timeoutMs = 10_000): Promise<T> {
  const until = Date.now() + timeoutMs
  for (;;) {
    const value = await check()
    if (value) return value
    if (Date.now() > until) throw new Error('timed out waiting')
    await new Promise(r => setTimeout(r, 100))
  }
}
