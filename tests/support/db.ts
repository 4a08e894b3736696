import postgres from 'postgres'
import { drizzle, type PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import * as schema from '../../server/database/schema'
import { defaultSiteSettings } from '../../shared/utils/site-settings'
import {
  areaCreateSchema, batteryCreateSchema, chargerCreateSchema, cylinderCreateSchema, truckCreateSchema,
} from '../../shared/utils/asset-schemas'
import type { Role } from '../../shared/types/auth'
import { sql } from 'drizzle-orm'
import { recomputeSubjects, type SubjectRef } from '../../server/utils/due/rules'
import { rebuildReadModels } from '../../server/utils/due/rebuild'

export const tables = schema
export type TestDb = PostgresJsDatabase<typeof schema>

let instance: { db: TestDb, client: postgres.Sql } | undefined

// A direct connection to the test database, for fixtures and for reading what the server wrote.
export function useTestDb(): TestDb {
  if (!instance) {
    const url = process.env.NUXT_DATABASE_URL
    if (!url || !new URL(url).pathname.endsWith('_test')) throw new Error('NUXT_DATABASE_URL must point at a database whose name ends in "_test".')
    const client = postgres(url, { max: 4, idle_timeout: 5, onnotice: () => {} })
    instance = { client, db: drizzle(client, { schema, casing: 'snake_case' }) }
  }
  return instance.db
}

export async function closeTestDb() {
  if (instance) {
    await instance.client.end({ timeout: 5 })
    instance = undefined
  }
}

const runTag = `${process.pid.toString(36)}${Math.random().toString(36).slice(2, 6)}`
let counter = 0

/** A name no other call in any test file has used: `prefix-<run>-<n>`. */
export function uniqueName(prefix: string): string {
  counter += 1
  return `${prefix}-${runTag}-${counter}`
}

export const uniqueEmail = (prefix = 'user') => `${uniqueName(prefix)}@example.test`.toLowerCase()

export const DEFAULT_PASSWORD = 'bay-door-open-4417'

// The same scrypt hasher nuxt-auth-utils uses, so the server verifies what the fixtures store.
const hasher = new Hash(new Scrypt({}))
const hashes = new Map<string, Promise<string>>()
const passwordHash = (password: string) => {
  if (!hashes.has(password)) hashes.set(password, hasher.make(password))
  return hashes.get(password)!
}

// Request bodies for the asset routes (everything but siteId), valid as they stand.

export const batteryInput = (over: Record<string, unknown> = {}) => ({
  serial: uniqueName('BAT'),
  chemistry: 'flooded_lead_acid',
  voltage: 36,
  cellCount: 18,
  capacityAh: 750,
  weightLb: 2100,
  lengthIn: 38.5,
  widthIn: 20.5,
  heightIn: 31,
  connector: 'Grey 350 A',
  ...over,
})

export const truckInput = (over: Record<string, unknown> = {}) => ({
  fleetNumber: uniqueName('FT'),
  truckClass: 1,
  power: 'electric',
  model: 'Rider 30',
  systemVoltage: 36,
  minBatteryWeightLb: 1800,
  maxBatteryWeightLb: 2400,
  allowedChemistries: ['flooded_lead_acid'],
  ...over,
})

export const chargerInput = (areaId: string, over: Record<string, unknown> = {}) => ({
  name: uniqueName('CHG'),
  areaId,
  chargerType: 'iu',
  outputVoltage: 36,
  maxCurrentA: 120,
  minCapacityAh: 500,
  maxCapacityAh: 1000,
  chemistryProfiles: ['flooded_lead_acid'],
  ...over,
})

export const cylinderInput = (over: Record<string, unknown> = {}) => ({
  serial: uniqueName('CYL'),
  specification: 'dot_4bw',
  waterCapacityLb: 79.5,
  tareLb: 30,
  nominalPropaneLb: 33.5,
  manufactureYear: 2020,
  manufactureMonth: 6,
  ...over,
})

export const areaInput = (over: Record<string, unknown> = {}) => ({
  kind: 'charging_area',
  name: uniqueName('Area'),
  ...over,
})

// Rows written straight to the database (no tag code, no audit row): the world a test starts from.
// Whatever a fixture writes, it recomputes the read models of (as the app's write path does), so the
// Bay board, the due list and the tag page see it.

/** The read models of these subjects, recomputed from their records (and the site's cached views dropped). */
export async function refreshReadModels(siteId: string, subjects: SubjectRef[]) {
  await useTestDb().transaction(async (tx) => {
    await recomputeSubjects(tx, siteId, subjects)
    await tx.execute(sql`SELECT site_revisions_touch(ARRAY[${siteId}]::uuid[])`)
  })
}

/** Every read model of the site from scratch (`npm run rebuild-state` for one site). */
export function rebuildSite(siteId: string) {
  return rebuildReadModels(useTestDb(), { siteIds: [siteId] })
}

export async function organization(over: Partial<typeof tables.organizations.$inferInsert> = {}) {
  const [row] = await useTestDb().insert(tables.organizations).values({ name: uniqueName('Org'), ...over }).returning()
  return row!
}

export async function site(over: Partial<typeof tables.sites.$inferInsert> = {}) {
  const organizationId = over.organizationId ?? (await organization()).id
  const [row] = await useTestDb().insert(tables.sites)
    .values({ name: uniqueName('Site'), settings: defaultSiteSettings(), ...over, organizationId }).returning()
  return row!
}

export async function area(over: { siteId: string } & Record<string, unknown>) {
  const { siteId, ...rest } = over
  const values = areaCreateSchema.parse(areaInput(rest))
  const [row] = await useTestDb().insert(tables.areas).values({ ...values, siteId }).returning()
  await refreshReadModels(siteId, [{ kind: 'area', id: row!.id }])
  return row!
}

export interface UserFixture {
  email?: string
  name?: string
  password?: string
  active?: boolean
  /** roles at `siteId` */
  siteId?: string
  roles?: Role[]
  /** roles at further sites */
  memberships?: { siteId: string, roles: Role[] }[]
}

/** A user with roles at one or more sites; the plain password comes back with the row. */
export async function user(over: UserFixture = {}) {
  const password = over.password ?? DEFAULT_PASSWORD
  const db = useTestDb()
  const [row] = await db.insert(tables.users).values({
    email: over.email ?? uniqueEmail(),
    name: over.name ?? uniqueName('Person'),
    passwordHash: await passwordHash(password),
    active: over.active ?? true,
  }).returning()
  const memberships = [...(over.siteId ? [{ siteId: over.siteId, roles: over.roles ?? ['operator' as Role] }] : []), ...(over.memberships ?? [])]
  const values = memberships.flatMap(m => m.roles.map(role => ({ userId: row!.id, siteId: m.siteId, role })))
  if (values.length) await db.insert(tables.memberships).values(values)
  for (const m of memberships) if (m.roles.includes('operator')) await refreshReadModels(m.siteId, [{ kind: 'person', id: row!.id }])
  return { ...row!, password }
}

export async function truck(over: { siteId: string } & Record<string, unknown>) {
  const { siteId, ...rest } = over
  const values = truckCreateSchema.parse(truckInput(rest))
  const [row] = await useTestDb().insert(tables.trucks).values({ ...values, siteId }).returning()
  const areas = await useTestDb().select({ id: tables.areas.id }).from(tables.areas).where(sql`${tables.areas.siteId} = ${siteId}`)
  await refreshReadModels(siteId, [{ kind: 'truck', id: row!.id }, ...areas.map(a => ({ kind: 'area' as const, id: a.id }))])
  return row!
}

export async function battery(over: { siteId: string } & Record<string, unknown>) {
  const { siteId, ...rest } = over
  const values = batteryCreateSchema.parse(batteryInput(rest))
  const [row] = await useTestDb().insert(tables.batteries).values({ ...values, siteId }).returning()
  await refreshReadModels(siteId, [{ kind: 'battery', id: row!.id }])
  return row!
}

/** A charger; without `areaId` it gets a new charging area at its site. */
export async function charger(over: { siteId: string, areaId?: string } & Record<string, unknown>) {
  const { siteId, areaId, ...rest } = over
  const inArea = areaId ?? (await area({ siteId, kind: 'charging_area' })).id
  const values = chargerCreateSchema.parse(chargerInput(inArea, rest))
  const [row] = await useTestDb().insert(tables.chargers).values({ ...values, siteId }).returning()
  await refreshReadModels(siteId, [{ kind: 'charger', id: row!.id }])
  return row!
}

export async function cylinder(over: { siteId: string } & Record<string, unknown>) {
  const { siteId, ...rest } = over
  const values = cylinderCreateSchema.parse(cylinderInput(rest))
  const [row] = await useTestDb().insert(tables.lpCylinders).values({ ...values, siteId }).returning()
  await refreshReadModels(siteId, [{ kind: 'cylinder', id: row!.id }])
  return row!
}
