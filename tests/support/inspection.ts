import { randomUUID } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { DEFAULT_INSPECTION_ITEMS, type InspectionPower } from '../../shared/utils/truck-inspection'
import { tables, useTestDb } from './db'
import { isoDaysFromNow } from './fuel'
import type { Client } from './http'

// Fixtures for the pre-shift inspection tests: answers, class qualifications, the truck's status row.

export type Answer = { key: string, result: 'pass' | 'fail' | 'not_applicable', note?: string, photoUploadId?: string }

/** Every item of the default checklist passed, but those in `fail` (key → note). */
export function answers(power: InspectionPower, fail: Record<string, string> = {}): Answer[] {
  return DEFAULT_INSPECTION_ITEMS[power].map(i => (i.key in fail ? { key: i.key, result: 'fail' as const, note: fail[i.key] } : { key: i.key, result: 'pass' as const }))
}

export function inspect(c: Client, truckId: string, body: { answers: Answer[], hourMeter?: number, templateVersion?: number, idempotencyKey?: string }) {
  return c.post(`/api/trucks/${truckId}/inspections`, { hourMeter: 1200, templateVersion: 1, idempotencyKey: randomUUID(), ...body })
}

/** A qualification on a truck class, evaluated `evaluatedDaysAgo` days back (null: trained, never evaluated). */
export async function classQualification(userId: string, truckClass: number, evaluatedDaysAgo: number | null = 30) {
  const [row] = await useTestDb().insert(tables.qualifications).values({
    userId, kind: `truck_class_${truckClass}` as 'truck_class_1', trainedOn: isoDaysFromNow(-(evaluatedDaysAgo ?? 30) - 10),
    evaluatedOn: evaluatedDaysAgo === null ? null : isoDaysFromNow(-evaluatedDaysAgo), expiresOn: isoDaysFromNow(3650),
  }).returning()
  return row!
}

export async function truckStatusOf(truckId: string) {
  const [row] = await useTestDb().select().from(tables.truckStatus).where(eq(tables.truckStatus.truckId, truckId))
  return row!
}

export async function followUpsOf(inspectionId: string) {
  return useTestDb().select().from(tables.followUps).where(eq(tables.followUps.sourceId, inspectionId))
}

export async function sitePolicy(siteId: string, settings: Record<string, unknown>) {
  const [s] = await useTestDb().select({ settings: tables.sites.settings }).from(tables.sites).where(eq(tables.sites.id, siteId))
  await useTestDb().update(tables.sites).set({ settings: { ...(s!.settings as object), ...settings } }).where(eq(tables.sites.id, siteId))
}
