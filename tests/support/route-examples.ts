import { createHash, randomBytes, randomUUID } from 'node:crypto'
import { mkdirSync, writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import Papa from 'papaparse'
import { eq } from 'drizzle-orm'
import type { Role } from '../../shared/types/auth'
import { client, signIn, type Client, type Reply } from './http'
import {
  area, areaInput, battery, batteryInput, charger, chargerInput, cylinder, cylinderInput, tables, truck, truckInput,
  uniqueEmail, uniqueName, user, useTestDb,
} from './db'
import { fittedTruck, openCharge, readyBattery, roomCharger, tagFor } from './battery-room'
import { PNG_BYTES, freshCylinder, lpTruck, passingInspection, upload } from './fuel'
import { CHARGING_KEYS, allPass, todayIn } from './due'
import { correctionBody, freshRecord } from './corrections'
import { CORRECTION_PATHS, type CorrectableKind } from '../../shared/utils/correction-schemas'
import { INSPECTION_EXAMPLES } from './route-examples-inspection'
import { REPORT_EXAMPLES } from './route-examples-reports'
import { AUDIT_PACK_EXAMPLES } from './route-examples-audit-pack'

// One request per route file that reaches the route's guard, for the role × route matrix
// (tests/e2e/access-matrix.test.ts). Each example gets the shared world and the caller, makes whatever
// fresh fixture a repeated request needs (a battery not yet on charge, a follow-up not yet closed), and
// answers a thunk that sends the request as the caller; the matrix measures around that thunk only.

export interface World {
  siteId: string
  areaId: string
  fuelId: string
  chargerId: string
  batteryId: string
  batteryTag: string
  truckId: string
  lpTruckId: string
  cylinderId: string
  cylinderSerial: string
  uploadId: string
  logEntryId: string
  techId: string
  tech: Client
  /** a technician at the site who is none of the callers, for the people routes */
  targetId: string
  calendarToken: string
}

export interface Caller {
  key: string
  client: Client
  /** the caller's roles at their own site (the other site for the outsider) */
  roles: Role[]
  siteId: string | null
  user: { id: string, email: string, password: string } | null
}

export interface Ctx {
  w: World
  caller: Caller
  /** the caller's client */
  c: Client
  /** a new person with the caller's roles at the caller's site, signed in (signed out for the signed-out caller) */
  twin: () => Promise<Client>
}

export type Send = () => Promise<Reply>
export interface Example {
  /** what an allowed caller is answered; any 2xx when left out */
  ok?: number[]
  run: (x: Ctx) => Send | Promise<Send>
}

const rootDir = fileURLToPath(new URL('../..', import.meta.url))
const get = (path: (w: World) => string): Example => ({ run: x => () => x.c.get(path(x.w)) })
const post = (path: (w: World) => string, body: (w: World) => unknown): Example => ({ run: x => () => x.c.post(path(x.w), body(x.w)) })
const inSite = (w: World) => `siteId=${w.siteId}`
/** A schedule a lead added at the site (a yearly area check), written straight to the database as a fixture. */
const customSchedule = async (w: World) => (await useTestDb().insert(tables.schedules).values({
  siteId: w.siteId, kind: 'custom', title: 'Eyewash station yearly inspection', appliesTo: 'Areas', subjectKind: 'area', rule: 'days',
  every: 1, everyUnit: 'year', dueSoonDays: 14, responsibleRole: 'technician', source: 'ANSI/ISEA Z358.1 (from memory)',
}).returning())[0]!

/** A correction of a fresh record of the kind (a record stands corrected once, so each request gets its own). */
const correction = (kind: CorrectableKind): Example => ({
  run: async (x) => {
    const rw = { ...x.w, userId: x.w.techId, truckId: (await fittedTruck(x.w.siteId)).id, areaId: x.w.fuelId }
    const id = await freshRecord(kind, rw)
    return () => x.c.post(`${CORRECTION_PATHS[kind]}/${id}/corrections`, correctionBody(kind, rw))
  },
})

type Kind = 'batteries' | 'trucks' | 'chargers' | 'cylinders' | 'areas'
const existing: Record<Kind, (w: World) => string> = {
  batteries: w => w.batteryId, trucks: w => w.truckId, chargers: w => w.chargerId, cylinders: w => w.cylinderId, areas: w => w.areaId,
}
const fresh: Record<Kind, (w: World) => Promise<{ id: string }>> = {
  batteries: w => battery({ siteId: w.siteId }),
  trucks: w => truck({ siteId: w.siteId }),
  chargers: w => charger({ siteId: w.siteId, areaId: w.areaId }),
  cylinders: w => cylinder({ siteId: w.siteId }),
  areas: w => area({ siteId: w.siteId }),
}
const input: Record<Kind, (w: World) => Record<string, unknown>> = {
  batteries: () => batteryInput(), trucks: () => truckInput(), chargers: w => chargerInput(w.areaId), cylinders: () => cylinderInput(), areas: () => areaInput(),
}
// CSV rows name areas, not ids
const csvRow: Record<Kind, () => Record<string, unknown>> = {
  batteries: () => batteryInput(), trucks: () => ({ ...truckInput(), allowedChemistries: 'flooded_lead_acid' }), chargers: () => ({ ...chargerInput('Matrix Room'), chemistryProfiles: 'flooded_lead_acid' }),
  cylinders: () => cylinderInput(), areas: () => areaInput(),
}

function registry(kind: Kind): Record<string, Example> {
  const base = `server/api/${kind}`
  const examples: Record<string, Example> = {
    [`${base}/[id].get.ts`]: get(w => `/api/${kind}/${existing[kind](w)}`),
    [`${base}/[id].patch.ts`]: { run: x => () => x.c.patch(`/api/${kind}/${existing[kind](x.w)}`, { notes: 'Checked by the matrix.' }) },
    [`${base}/export.get.ts`]: get(w => `/api/${kind}/export?${inSite(w)}`),
    [`${base}/import.post.ts`]: post(() => `/api/${kind}/import`, w => ({ siteId: w.siteId, csv: Papa.unparse([csvRow[kind]()]), dryRun: true })),
    [`${base}/index.get.ts`]: get(w => `/api/${kind}?${inSite(w)}`),
    [`${base}/index.post.ts`]: post(() => `/api/${kind}`, w => ({ siteId: w.siteId, ...input[kind](w) })),
  }
  if (kind !== 'areas') {
    examples[`${base}/[id]/out-of-service.post.ts`] = {
      run: async (x) => {
        const { id } = await fresh[kind](x.w)
        return () => x.c.post(`/api/${kind}/${id}/out-of-service`, { outOfService: true, reason: 'Cracked cable lug.' })
      },
    }
  }
  return examples
}

/** A finished job of the caller's, written where the server keeps jobs (background_jobs; its file under .data/uploads/jobs). */
async function jobOf(userId: string, siteId: string, withPdf: boolean): Promise<string> {
  const id = randomUUID()
  await useTestDb().insert(tables.backgroundJobs).values({ id, kind: 'labels', siteId, userId, status: 'done', done: 1, total: 1, result: { labels: 1 }, finishedAt: new Date() })
  if (withPdf) {
    mkdirSync(`${rootDir}.data/uploads/jobs`, { recursive: true })
    writeFileSync(`${rootDir}.data/uploads/jobs/${id}`, Buffer.from('%PDF-1.4\n%%EOF\n'))
  }
  return id
}

/** A fresh charging area with today's log filled in by the world's technician; answers the area and one entry. */
async function filledLog(w: World) {
  const a = await area({ siteId: w.siteId, kind: 'charging_area' })
  const res = await w.tech.post('/api/logs/entries', { siteId: w.siteId, areaId: a.id, date: todayIn(), entries: allPass(CHARGING_KEYS) })
  if (res.status !== 201) throw new Error(`log fixture answered ${res.status}`)
  const [entry] = await useTestDb().select({ id: tables.areaLogEntries.id }).from(tables.areaLogEntries)
    .innerJoin(tables.areaLogs, eq(tables.areaLogs.id, tables.areaLogEntries.logId)).where(eq(tables.areaLogs.areaId, a.id)).limit(1)
  return { areaId: a.id, entryId: entry!.id }
}

const today = () => todayIn()

export const ROUTE_EXAMPLES: Record<string, Example> = {
  ...registry('areas'), ...registry('batteries'), ...registry('chargers'), ...registry('cylinders'), ...registry('trucks'),
  ...INSPECTION_EXAMPLES,
  ...REPORT_EXAMPLES,
  ...AUDIT_PACK_EXAMPLES,

  'server/api/health.get.ts': get(() => '/api/health'),
  'server/api/auth/sign-in.post.ts': {
    run: async () => {
      const who = await user()
      return () => client().post('/api/auth/sign-in', { email: who.email, password: who.password })
    },
  },
  'server/api/auth/sign-out.post.ts': { run: async x => async () => (await x.twin()).post('/api/auth/sign-out') },
  'server/api/auth/password-reset/request.post.ts': { run: x => () => x.c.post('/api/auth/password-reset/request', { email: uniqueEmail('reset') }) },
  'server/api/auth/password-reset/complete.post.ts': {
    run: async (x) => {
      const who = await user()
      const token = randomBytes(32).toString('base64url')
      await useTestDb().insert(tables.passwordResets).values({ userId: who.id, tokenHash: createHash('sha256').update(token).digest('hex'), expiresAt: new Date(Date.now() + 600_000) })
      return () => x.c.post('/api/auth/password-reset/complete', { token, password: 'matrix-new-password-42' })
    },
  },
  'server/api/auth/password.post.ts': {
    run: async (x) => {
      const c = await x.twin()
      return () => c.post('/api/auth/password', { currentPassword: 'bay-door-open-4417', newPassword: 'matrix-changed-password-7' })
    },
  },
  'server/routes/calendar/[token].ics.ts': get(w => `/calendar/${w.calendarToken}.ics`),

  'server/api/me.get.ts': get(() => '/api/me'),
  'server/api/me/language.put.ts': { run: x => () => x.c.put('/api/me/language', { language: 'es' }) },
  'server/api/sites/index.get.ts': get(() => '/api/sites'),
  'server/api/sites/index.post.ts': post(() => '/api/sites', () => ({ name: uniqueName('Annex') })),
  'server/api/sites/[id].patch.ts': { run: x => () => x.c.patch(`/api/sites/${x.w.siteId}`, { address: '1 Quay Road' }) },
  'server/api/summary.get.ts': get(w => `/api/summary?${inSite(w)}`),
  'server/api/calendar/feeds/index.get.ts': get(() => '/api/calendar/feeds'),
  'server/api/calendar/feeds/index.post.ts': post(() => '/api/calendar/feeds', () => ({})),
  'server/api/calendar/feeds/[id].delete.ts': {
    run: async (x) => {
      const own = x.caller.user ? (await x.c.post('/api/calendar/feeds')).body.item.id as string : randomUUID()
      return () => x.c.delete(`/api/calendar/feeds/${own}`)
    },
  },
  'server/api/jobs/[id].get.ts': { run: async (x) => {
    const id = x.caller.user ? await jobOf(x.caller.user.id, x.w.siteId, false) : randomUUID()
    return () => x.c.get(`/api/jobs/${id}`)
  } },
  'server/api/labels/[id]/pdf.get.ts': { run: async (x) => {
    const id = x.caller.user ? await jobOf(x.caller.user.id, x.w.siteId, true) : randomUUID()
    return () => x.c.get(`/api/labels/${id}/pdf`)
  } },
  'server/api/labels/index.post.ts': post(() => '/api/labels', w => ({ siteId: w.siteId, kind: 'battery', ids: [w.batteryId] })),
  'server/api/labels/preview.post.ts': post(() => '/api/labels/preview', w => ({ siteId: w.siteId, kind: 'battery', ids: [w.batteryId] })),

  'server/api/battery-room/board.get.ts': get(w => `/api/battery-room/board?${inSite(w)}`),
  'server/api/battery-room/lookup.get.ts': get(w => `/api/battery-room/lookup?${inSite(w)}&code=${w.batteryTag}`),
  'server/api/battery-room/overrides.get.ts': get(w => `/api/battery-room/overrides?${inSite(w)}`),
  'server/api/battery-room/overrides/export.get.ts': get(w => `/api/battery-room/overrides/export?${inSite(w)}`),
  'server/api/battery-room/swaps.post.ts': {
    run: async (x) => {
      const t = await fittedTruck(x.w.siteId)
      const b = await readyBattery({ siteId: x.w.siteId, userId: x.w.techId, chargerId: x.w.chargerId })
      return () => x.c.post('/api/battery-room/swaps', { truckId: t.id, batteryInId: b.id, hourMeter: 1, idempotencyKey: randomUUID() })
    },
  },
  'server/api/battery-room/charges.post.ts': {
    run: async (x) => {
      const b = await battery({ siteId: x.w.siteId })
      const ch = await roomCharger(x.w.siteId, x.w.areaId)
      return () => x.c.post('/api/battery-room/charges', { batteryId: b.id, chargerId: ch.id, idempotencyKey: randomUUID() })
    },
  },
  'server/api/battery-room/charges/[id]/end.post.ts': {
    run: async (x) => {
      const b = await battery({ siteId: x.w.siteId })
      const ch = await roomCharger(x.w.siteId, x.w.areaId)
      const s = await openCharge({ siteId: x.w.siteId, userId: x.w.techId, batteryId: b.id, chargerId: ch.id, startedHoursAgo: 3 })
      return () => x.c.post(`/api/battery-room/charges/${s.id}/end`, { ampHoursReturned: 400, endTempF: 95, outcome: 'complete' })
    },
  },
  'server/api/battery-room/checks.post.ts': post(() => '/api/battery-room/checks', w => ({
    batteryId: w.batteryId, idempotencyKey: randomUUID(), level: 'ok', scope: 'pilot_cell', cells: [{ cellNumber: 1, specificGravity: 1.275, temperatureF: 82 }],
  })),

  'server/api/cylinders/[id]/quarantine.post.ts': {
    run: async (x) => {
      const c = await freshCylinder(x.w.siteId, { areaId: x.w.fuelId, status: 'empty' })
      return () => x.c.post(`/api/cylinders/${c.id}/quarantine`, { reason: 'Dented foot ring.' })
    },
  },
  'server/api/cylinders/[id]/refills.post.ts': {
    run: async (x) => {
      const c = await freshCylinder(x.w.siteId, { areaId: x.w.fuelId, status: 'empty' })
      return () => x.c.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62 })
    },
  },
  'server/api/cylinders/[id]/requalifications.get.ts': get(w => `/api/cylinders/${w.cylinderId}/requalifications`),
  'server/api/cylinders/[id]/requalifications.post.ts': {
    run: async (x) => {
      const c = await freshCylinder(x.w.siteId, { areaId: x.w.fuelId })
      return () => x.c.post(`/api/cylinders/${c.id}/requalifications`, { performedOn: today(), method: 'external_visual', passed: true })
    },
  },
  'server/api/trucks/[id]/cylinder-exchanges.post.ts': {
    run: async (x) => {
      const t = await lpTruck(x.w.siteId)
      const c = await freshCylinder(x.w.siteId, { areaId: x.w.fuelId, status: 'full' })
      return () => x.c.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: c.id, idempotencyKey: randomUUID() })
    },
  },
  'server/api/trucks/[id]/emissions-tests.get.ts': get(w => `/api/trucks/${w.lpTruckId}/emissions-tests`),
  'server/api/trucks/[id]/emissions-tests.post.ts': post(w => `/api/trucks/${w.lpTruckId}/emissions-tests`, () => ({ testedOn: today(), testerName: 'Tess Tester', coIdlePct: 0.5, coHighIdlePct: 0.5 })),
  'server/api/fuel/cage.get.ts': get(w => `/api/fuel/cage?${inSite(w)}`),
  'server/api/fuel/co.get.ts': get(w => `/api/fuel/co?${inSite(w)}`),
  'server/api/fuel/co-readings.post.ts': post(() => '/api/fuel/co-readings', w => ({ siteId: w.siteId, areaId: w.fuelId, takenOn: today(), readings: [{ ppm: 5, durationHours: 8 }] })),
  'server/api/fuel/cylinders/lookup.get.ts': get(w => `/api/fuel/cylinders/lookup?${inSite(w)}&code=${w.cylinderSerial}`),
  'server/api/fuel/emissions.get.ts': get(w => `/api/fuel/emissions?${inSite(w)}`),
  'server/api/fuel/lp-trucks.get.ts': get(w => `/api/fuel/lp-trucks?${inSite(w)}`),

  'server/api/due/index.get.ts': get(w => `/api/due?${inSite(w)}`),
  'server/api/due/export.get.ts': get(w => `/api/due/export?${inSite(w)}`),
  'server/api/schedules/index.get.ts': get(w => `/api/schedules?${inSite(w)}`),
  'server/api/schedules/[kind].put.ts': { run: x => () => x.c.put('/api/schedules/eyewash_activation', { siteId: x.w.siteId, dueSoonDays: 2 }) },
  'server/api/schedules/custom/index.post.ts': post(() => '/api/schedules/custom', w => ({ siteId: w.siteId, title: 'Charger preventive maintenance', subjectKind: 'charger', every: 6, unit: 'month', dueSoonDays: 14, responsibleRole: 'technician', source: 'Common practice' })),
  'server/api/schedules/custom/[id].get.ts': { run: async x => (id => () => x.c.get(`/api/schedules/custom/${id}`))((await customSchedule(x.w)).id) },
  'server/api/schedules/custom/[id].patch.ts': { run: async x => (id => () => x.c.patch(`/api/schedules/custom/${id}`, { siteId: x.w.siteId, dueSoonDays: 21 }))((await customSchedule(x.w)).id) },
  'server/api/schedules/custom/[id]/completions.post.ts': {
    run: async (x) => {
      const s = await customSchedule(x.w)
      return () => x.c.post(`/api/schedules/custom/${s.id}/completions`, { subjectId: x.w.areaId, doneOn: today(), note: 'Flushed, flow and temperature checked', idempotencyKey: randomUUID() })
    },
  },
  'server/api/history/[kind]/[id].get.ts': get(w => `/api/history/battery/${w.batteryId}`),
  'server/api/history/[kind]/[id]/export.get.ts': get(w => `/api/history/battery/${w.batteryId}/export`),
  'server/api/battery-room/swaps/[id]/corrections.post.ts': correction('battery-swap'),
  'server/api/battery-room/charges/[id]/corrections.post.ts': correction('charge-session'),
  'server/api/battery-room/checks/[id]/corrections.post.ts': correction('electrolyte-check'),
  'server/api/fuel/refills/[id]/corrections.post.ts': correction('cylinder-refill'),
  'server/api/fuel/cylinder-exchanges/[id]/corrections.post.ts': correction('cylinder-exchange'),
  'server/api/fuel/requalifications/[id]/corrections.post.ts': correction('requalification'),
  'server/api/fuel/emissions-tests/[id]/corrections.post.ts': correction('emissions-test'),
  'server/api/fuel/co-readings/[id]/corrections.post.ts': correction('co-reading'),
  'server/api/tags/[code].get.ts': get(w => `/api/tags/${w.batteryTag}`),
  'server/api/tags/[code]/qr.get.ts': get(w => `/api/tags/${w.batteryTag}/qr`),
  'server/api/tags/[code]/retag.post.ts': {
    run: async (x) => {
      const b = await battery({ siteId: x.w.siteId })
      const code = await tagFor('battery', b.id, x.w.siteId)
      return () => x.c.post(`/api/tags/${code}/retag`, { reason: 'Label scuffed off.' })
    },
  },
  'server/api/uploads/index.post.ts': { run: x => () => upload(x.c, x.w.siteId, PNG_BYTES, 'matrix.png') },
  'server/api/uploads/[id].get.ts': get(w => `/api/uploads/${w.uploadId}`),
  'server/api/ventilation/index.get.ts': get(w => `/api/ventilation?${inSite(w)}&areaId=${w.areaId}`),

  'server/api/incidents/index.get.ts': get(w => `/api/incidents?${inSite(w)}`),
  'server/api/incidents/index.post.ts': post(() => '/api/incidents', w => ({ siteId: w.siteId, kind: 'near_miss', areaId: w.areaId, description: 'Truck reversed close to a charger cable.' })),
  'server/api/follow-ups/index.get.ts': get(w => `/api/follow-ups?${inSite(w)}`),
  'server/api/follow-ups/[id]/close.post.ts': {
    run: async (x) => {
      const [f] = await useTestDb().insert(tables.followUps).values({ siteId: x.w.siteId, source: 'incident', sourceId: randomUUID(), title: 'Check the spill kit', openedOn: today() }).returning()
      return () => x.c.post(`/api/follow-ups/${f!.id}/close`, { note: 'Restocked the neutralizer.' })
    },
  },
  'server/api/logs/index.get.ts': get(w => `/api/logs?${inSite(w)}&areaId=${w.areaId}`),
  'server/api/logs/export.get.ts': get(w => `/api/logs/export?${inSite(w)}&from=${today()}&to=${today()}`),
  'server/api/logs/report.get.ts': get(w => `/api/logs/report?${inSite(w)}&from=${today()}&to=${today()}`),
  'server/api/logs/templates/index.get.ts': get(w => `/api/logs/templates?${inSite(w)}`),
  'server/api/logs/templates/index.post.ts': post(() => '/api/logs/templates', w => ({ siteId: w.siteId, areaKind: 'charging_area', cadence: 'weekly', title: 'Weekly walk-round', items: [{ label: 'Eyewash tested' }] })),
  'server/api/logs/entries.post.ts': {
    run: async (x) => {
      const a = await area({ siteId: x.w.siteId, kind: 'charging_area' })
      return () => x.c.post('/api/logs/entries', { siteId: x.w.siteId, areaId: a.id, date: today(), entries: allPass(CHARGING_KEYS) })
    },
  },
  // entries are never edited in place: those who record them are pointed at corrections
  'server/api/logs/entries/[id].patch.ts': { ok: [409], run: x => () => x.c.patch(`/api/logs/entries/${x.w.logEntryId}`, { result: 'fail' }) },
  'server/api/logs/entries/[id]/corrections.post.ts': {
    run: async (x) => {
      const { entryId } = await filledLog(x.w)
      return () => x.c.post(`/api/logs/entries/${entryId}/corrections`, { result: 'fail', note: 'Gauge read wrong.', reason: 'Misread the gauge.' })
    },
  },
  'server/api/logs/sign.post.ts': {
    run: async (x) => {
      const { areaId } = await filledLog(x.w)
      return () => x.c.post('/api/logs/sign', { siteId: x.w.siteId, areaId, date: today() })
    },
  },

  'server/api/mail/index.get.ts': get(w => `/api/mail?${inSite(w)}`),
  'server/api/mail/retry.post.ts': post(() => '/api/mail/retry', w => ({ siteId: w.siteId })),
  'server/api/mail/digest.post.ts': post(() => '/api/mail/digest', w => ({ siteId: w.siteId })),

  'server/api/users/index.get.ts': get(w => `/api/users?${inSite(w)}`),
  'server/api/users/index.post.ts': post(() => '/api/users', w => ({ siteId: w.siteId, email: uniqueEmail('hire'), name: uniqueName('Hire'), password: 'first-shift-2231', roles: ['operator'] })),
  'server/api/users/[id].patch.ts': { run: x => () => x.c.patch(`/api/users/${x.w.targetId}`, { name: uniqueName('Renamed') }) },
  'server/api/users/[id]/roles.put.ts': { run: x => () => x.c.put(`/api/users/${x.w.targetId}/roles`, { siteId: x.w.siteId, roles: ['technician'] }) },
  'server/api/users/[id]/qualifications.post.ts': post(w => `/api/users/${w.targetId}/qualifications`, () => ({ kind: 'truck_class_1', trainedOn: '2026-01-12', expiresOn: '2029-01-12' })),
  'server/api/users/[id]/password-link.post.ts': {
    run: async (x) => {
      // a person of their own per request: links to one address are limited to three in 15 minutes
      const who = await user({ siteId: x.w.siteId, roles: ['operator'] })
      return () => x.c.post(`/api/users/${who.id}/password-link`)
    },
  },
}

/** The callers: each role alone at the site, a member of another site holding every role there, and nobody. */
export async function matrixCallers(siteId: string, otherSiteId: string, roles: readonly Role[]): Promise<Caller[]> {
  const callers: Caller[] = []
  const qualified = async (u: { id: string }) => {
    await useTestDb().insert(tables.qualifications).values(['lp_gas_transfer', 'battery_changing', 'truck_class_5'].map(kind => ({
      userId: u.id, kind: kind as 'lp_gas_transfer', trainedOn: '2025-01-06', expiresOn: '2099-12-31',
    })))
  }
  for (const role of roles) {
    const u = await user({ siteId, roles: [role] })
    await qualified(u)
    callers.push({ key: role, client: await signIn(u), roles: [role], siteId, user: u })
  }
  const outsider = await user({ siteId: otherSiteId, roles: [...roles] })
  await qualified(outsider)
  callers.push({ key: 'other site', client: await signIn(outsider), roles: [...roles], siteId: otherSiteId, user: outsider })
  callers.push({ key: 'signed out', client: client(), roles: [], siteId: null, user: null })
  return callers
}

/** A signed-in person like the caller (same roles at the same site), or a signed-out client. */
export async function twinOf(caller: Caller): Promise<Client> {
  if (!caller.siteId) return client()
  return signIn(await user({ siteId: caller.siteId, roles: caller.roles }))
}

/** The world every example starts from, made once. */
export async function matrixWorld(siteId: string, tech: { id: string, client: Client }, adminClient: Client): Promise<World> {
  const a = await area({ siteId, kind: 'charging_area', name: 'Matrix Room' })
  const fuel = await area({ siteId, kind: 'fuel_station' })
  const ch = await roomCharger(siteId, a.id)
  const b = await battery({ siteId, homeAreaId: a.id })
  const cyl = await freshCylinder(siteId, { areaId: fuel.id })
  const target = await user({ siteId, roles: ['technician'] })
  const uploaded = await upload(adminClient, siteId, PNG_BYTES, 'fixture.png')
  const feed = await adminClient.post('/api/calendar/feeds')
  const w: World = {
    siteId, areaId: a.id, fuelId: fuel.id, chargerId: ch.id, batteryId: b.id, batteryTag: await tagFor('battery', b.id, siteId),
    truckId: (await truck({ siteId })).id, lpTruckId: (await lpTruck(siteId)).id, cylinderId: cyl.id, cylinderSerial: cyl.serial,
    uploadId: uploaded.body.item.id, logEntryId: '', techId: tech.id, tech: tech.client, targetId: target.id,
    calendarToken: /\/calendar\/([^/.]+)\.ics/.exec(String(feed.body.item.url))![1]!,
  }
  w.logEntryId = (await filledLog(w)).entryId
  return w
}
