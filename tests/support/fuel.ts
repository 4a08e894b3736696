import { existsSync, readdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { url } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { PREFILL_INSPECTION_ITEMS } from '../../shared/utils/lp-gas'
import type { Role } from '../../shared/types/auth'
import { area, cylinder, refreshReadModels, tables, truck, user, useTestDb } from './db'
import { signIn, type Client, type Reply } from './http'
import { s3Keys } from './s3'

const rootDir = fileURLToPath(new URL('../..', import.meta.url))

// Fixtures for the fuel-station tests: stations, trained people, LP trucks, cylinders and uploads.

export const passingInspection = () => Object.fromEntries(PREFILL_INSPECTION_ITEMS.map(i => [i.key, 'pass']))

/** A calendar date `days` from today at a test site (sites default to America/Chicago), as the server counts it. */
export function isoDaysFromNow(days: number, timeZone = 'America/Chicago'): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(Date.now() + days * 86_400_000))
}

export const fuelStation = (siteId: string, lpStorageLimitLb: number | null = 300) =>
  area({ siteId, kind: 'fuel_station', lpStorageLimitLb })

/** An LP-gas transfer qualification that expires `expiresInDays` from today (negative: expired). */
export async function lpTransferQualification(userId: string, expiresInDays = 365) {
  const [row] = await useTestDb().insert(tables.qualifications).values({
    userId, kind: 'lp_gas_transfer', trainedOn: isoDaysFromNow(-400), expiresOn: isoDaysFromNow(expiresInDays),
  }).returning()
  return row!
}

/** A signed-in person with roles at a site and, unless told otherwise, a current LP-gas transfer qualification. */
export async function fuelPerson(siteId: string, roles: Role[], { trained = true } = {}): Promise<{ client: Client, id: string }> {
  const u = await user({ siteId, roles })
  if (trained) await lpTransferQualification(u.id)
  return { client: await signIn(u), id: u.id }
}

export const lpTruck = (siteId: string, over: Record<string, unknown> = {}) =>
  truck({ siteId, power: 'lp_gas', truckClass: 5, systemVoltage: null, minBatteryWeightLb: null, maxBatteryWeightLb: null, allowedChemistries: [], ...over })

// A cylinder made last January (in date for 11 years or more) unless told otherwise: 79.5 lb water capacity, 30 lb tare.
export async function freshCylinder(siteId: string, over: Record<string, unknown> = {}) {
  const row = await cylinder({ siteId, manufactureYear: new Date().getFullYear() - 1, manufactureMonth: 1, ...over })
  const extra: Partial<typeof tables.lpCylinders.$inferInsert> = {}
  if (over.status) extra.status = over.status as typeof row.status
  if (over.currentTruckId) extra.currentTruckId = over.currentTruckId as string
  if (Object.keys(extra).length) await useTestDb().update(tables.lpCylinders).set(extra).where(eq(tables.lpCylinders.id, row.id))
  if (Object.keys(extra).length) await refreshReadModels(siteId, [{ kind: 'cylinder', id: row.id }])
  return { ...row, ...extra }
}

export async function storedCylinder(id: string) {
  const [row] = await useTestDb().select().from(tables.lpCylinders).where(eq(tables.lpCylinders.id, id))
  return row!
}

export async function refillsOf(cylinderId: string) {
  return useTestDb().select().from(tables.cylinderRefills).where(eq(tables.cylinderRefills.cylinderId, cylinderId))
}

export async function uploadsAt(siteId: string) {
  return useTestDb().select().from(tables.uploads).where(eq(tables.uploads.siteId, siteId))
}

/** Files the server wrote for a site: in the local upload folder, or in the bucket when the tests run against S3. */
export async function storedFilesAt(siteId: string): Promise<string[]> {
  if (process.env.NUXT_UPLOADS_DRIVER === 's3') return s3Keys(`${siteId}/`)
  const dir = `${rootDir}.data/uploads/${siteId}`
  return existsSync(dir) ? readdirSync(dir) : []
}

/** POST /api/uploads as multipart/form-data with the client's session cookie. */
export async function upload(c: Client, siteId: string, bytes: Uint8Array, fileName: string, type = 'application/octet-stream'): Promise<Reply> {
  const form = new FormData()
  form.append('file', new Blob([bytes], { type }), fileName)
  const res = await fetch(url(`/api/uploads?siteId=${siteId}`), { method: 'POST', headers: c.cookie ? { cookie: c.cookie, accept: 'application/json' } : { accept: 'application/json' }, body: form })
  const text = await res.text()
  let body: unknown = text
  try {
    body = JSON.parse(text)
  }
  catch { /* not JSON */ }
  return { status: res.status, body, headers: res.headers }
}

/** A small valid PDF / PNG / JPEG by their magic numbers. */
export const PDF_BYTES = new TextEncoder().encode('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n')
export const PNG_BYTES = new Uint8Array([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52])
export const JPEG_BYTES = new Uint8Array([0xFF, 0xD8, 0xFF, 0xE0, 0, 16, 0x4A, 0x46, 0x49, 0x46, 0, 1])
