import type { H3Event } from 'h3'
import { z } from 'zod'
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import type { SQL } from 'drizzle-orm'
import type { AssetKind } from '#shared/utils/asset-schemas'
import {
  AREA_KINDS, BATTERY_CHEMISTRIES, CYLINDER_SPECS, CYLINDER_STATUSES, TRUCK_POWERS,
  assetCreateSchemas, assetFieldSchemas, idParamsSchema, outOfServiceSchema,
} from '#shared/utils/asset-schemas'

const bool = z.enum(['true', 'false']).transform(v => v === 'true')
const intParam = z.coerce.number().int()

export interface KindConfig {
  table: PgTable & { id: PgColumn, siteId: PgColumn }
  noun: string
  identity: string
  sortable: Record<string, PgColumn>
  defaultSort: string
  search: PgColumn[]
  filters: Record<string, { schema: z.ZodType, column: PgColumn, op?: 'eq' | 'any' }>
  /** area reference columns and the area kind they must point at (null: any kind) */
  areaRefs: Record<string, (typeof AREA_KINDS)[number] | null>
  /** an asset kind that can be put out of service */
  holdable: boolean
  /** its status read model, joined into the list: the columns it adds (they override the row's) */
  status?: { table: PgTable, on: SQL, columns: Record<string, PgColumn> }
}

function kinds(): Record<AssetKind, KindConfig> {
  const { trucks: t, batteries: b, chargers: c, lpCylinders: l, areas: a, batteryStatus: bs, truckStatus: ts } = tables
  return {
    truck: {
      table: t, noun: 'truck', identity: 'fleetNumber', defaultSort: 'fleetNumber',
      sortable: { fleetNumber: natural(t.fleetNumber) as unknown as PgColumn, truckClass: t.truckClass, power: t.power, systemVoltage: t.systemVoltage, hourMeter: sql`COALESCE(${ts.hourMeter}, ${t.hourMeter})` as unknown as PgColumn, createdAt: t.createdAt },
      search: [t.fleetNumber, t.model],
      filters: {
        power: { schema: z.enum(TRUCK_POWERS), column: t.power },
        truckClass: { schema: intParam.min(1).max(7), column: t.truckClass },
        homeAreaId: { schema: z.uuid(), column: t.homeAreaId },
        outOfService: { schema: bool, column: t.outOfService },
      },
      areaRefs: { homeAreaId: null }, holdable: true,
      status: { table: ts, on: statusOf(ts.truckId, t.id, ts.siteId, t.siteId), columns: { hourMeter: ts.hourMeter } },
    },
    battery: {
      table: b, noun: 'battery', identity: 'serial', defaultSort: 'serial',
      sortable: { serial: natural(b.serial) as unknown as PgColumn, voltage: b.voltage, capacityAh: b.capacityAh, chemistry: b.chemistry, weightLb: b.weightLb, cycleCount: bs.cycles, inServiceOn: b.inServiceOn, createdAt: b.createdAt },
      search: [b.serial, b.connector],
      filters: {
        chemistry: { schema: z.enum(BATTERY_CHEMISTRIES), column: b.chemistry },
        voltage: { schema: intParam.min(1).max(200), column: b.voltage },
        homeAreaId: { schema: z.uuid(), column: b.homeAreaId },
        outOfService: { schema: bool, column: b.outOfService },
      },
      areaRefs: { homeAreaId: 'charging_area' }, holdable: true,
      status: { table: bs, on: statusOf(bs.batteryId, b.id, bs.siteId, b.siteId), columns: { cycleCount: bs.cycles, state: bs.state, readyAt: bs.readyAt } },
    },
    charger: {
      table: c, noun: 'charger', identity: 'name', defaultSort: 'name',
      sortable: { name: natural(c.name) as unknown as PgColumn, outputVoltage: c.outputVoltage, maxCurrentA: c.maxCurrentA, chargerType: c.chargerType, createdAt: c.createdAt },
      search: [c.name, c.serial],
      filters: {
        areaId: { schema: z.uuid(), column: c.areaId },
        outputVoltage: { schema: intParam.min(1).max(200), column: c.outputVoltage },
        outOfService: { schema: bool, column: c.outOfService },
      },
      areaRefs: { areaId: 'charging_area' }, holdable: true,
    },
    cylinder: {
      table: l, noun: 'LP cylinder', identity: 'serial', defaultSort: 'serial',
      sortable: { serial: natural(l.serial) as unknown as PgColumn, status: l.status, waterCapacityLb: l.waterCapacityLb, manufactureYear: l.manufactureYear, lastRequalifiedOn: l.lastRequalifiedOn, createdAt: l.createdAt },
      search: [l.serial],
      filters: {
        status: { schema: z.enum(CYLINDER_STATUSES), column: l.status },
        specification: { schema: z.enum(CYLINDER_SPECS), column: l.specification },
        areaId: { schema: z.uuid(), column: l.areaId },
        outOfService: { schema: bool, column: l.outOfService },
      },
      areaRefs: { areaId: 'fuel_station' }, holdable: true,
    },
    area: {
      table: a as unknown as KindConfig['table'], noun: 'area', identity: 'name', defaultSort: 'name',
      sortable: { name: natural(a.name) as unknown as PgColumn, kind: a.kind, createdAt: a.createdAt },
      search: [a.name],
      filters: { kind: { schema: z.enum(AREA_KINDS), column: a.kind } },
      areaRefs: {}, holdable: false,
    },
  }
}

let cached: Record<AssetKind, KindConfig> | undefined
export const assetKinds = () => (cached ??= kinds())

// The asset's id is named with its table: drizzle writes a lone column unqualified in a select
// list, and inside this subquery a bare "id" would be tags.id.
export function liveTagCode(kind: AssetKind, table: PgTable) {
  return sql<string | null>`(SELECT code FROM tags WHERE tags.asset_kind = ${kind} AND tags.asset_id = ${table}.id AND tags.retired_at IS NULL)`
}

// A status row joined by its subject's id and site: the site lets PostgreSQL read only the site's status rows by
// index (joined by id alone, it read all of them: 25,000 battery rows for a page of 50).
function statusOf(statusId: PgColumn, id: PgColumn, statusSite: PgColumn, site: PgColumn): SQL {
  return and(eq(statusId, id), eq(statusSite, site))!
}

// Finds one asset by id among the sites the user belongs to; anything else is 404.
// A registry row out of the person's reach (refusal.no_such_<kind>).
function noSuchAsset(kind: AssetKind) {
  return codedError(404, `no_such_${kind}`, `No such ${assetKinds()[kind].noun}.`)
}

export async function findAssetForActor(event: H3Event, kind: AssetKind, id: string) {
  const actor = await requireActor(event)
  const cfg = assetKinds()[kind]
  if (actor.siteIds.length === 0) throw noSuchAsset(kind)
  const [found] = await useDb()
    .select({ row: cfg.table, tagCode: liveTagCode(kind, cfg.table) })
    .from(cfg.table as PgTable)
    .where(and(eq(cfg.table.id, id), inArray(cfg.table.siteId, actor.siteIds)))
  if (!found) throw noSuchAsset(kind)
  const row = found.row as Record<string, unknown> & { id: string, siteId: string }
  return { actor, row, tagCode: found.tagCode }
}

export async function getAsset(event: H3Event, kind: AssetKind) {
  const { id } = validateParams(event, idParamsSchema)
  const { actor, row, tagCode } = await findAssetForActor(event, kind, id)
  return { item: { ...row, tagCode }, roles: rolesAt(actor, row.siteId) }
}

function conflict(kind: AssetKind, values: Record<string, unknown>, error: unknown): never {
  const cfg = assetKinds()[kind]
  const unstorable = unstorableValueError(error, values)
  if (unstorable) throw unstorable
  if (isUniqueViolation(error)) {
    const name = String(values[cfg.identity])
    throw codedError(409, 'asset_taken', `A ${cfg.noun} "${name}" already exists at this site.`, { params: { name }, fields: { [cfg.identity]: 'Already used at this site.' } })
  }
  throw error
}

const createBody = z.object({ siteId: z.uuid('Pick a site.') }).loose()

export async function createAsset(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const { siteId, ...rest } = await validateBody(event, createBody)
  const actor = await requireAbility(event, 'asset.edit', siteId)
  const parsed = assetCreateSchemas[kind].safeParse(rest)
  if (!parsed.success) throw schemaFieldsError(parsed.error)
  const values = parsed.data as Record<string, unknown>
  refuseRuleProblems(assetRuleProblems(kind, values, await siteAreaKinds(siteId)))
  try {
    return await useDb().transaction(async (tx) => {
      const [row] = await tx.insert(cfg.table).values({ ...values, siteId } as never).returning()
      const created = row as Record<string, unknown> & { id: string }
      const tagCode = await issueTag(tx, kind, created.id, siteId)
      await writeAudit(tx, { actor, siteId, action: 'create', entity: kind, entityId: created.id, after: created })
      await recomputeSubjects(tx, siteId, await registrySubjects(tx, kind, { id: created.id, siteId }))
      setResponseStatus(event, 201)
      return { item: { ...created, tagCode } }
    })
  }
  catch (error) {
    conflict(kind, values, error)
  }
}

export async function updateAsset(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const { id } = validateParams(event, idParamsSchema)
  const { statusReason, ...patch } = await validateBody(event, z.record(z.string(), z.unknown()))
  const fieldKeys = Object.keys(assetFieldSchemas[kind].shape)
  const unknown = Object.keys(patch).filter(k => !fieldKeys.includes(k))
  if (unknown.length) {
    throw checkFieldsError(Object.fromEntries(unknown.map(k => [k, 'Not a field of this record.'])), `Unknown field: ${unknown.join(', ')}.`,
      Object.fromEntries(unknown.map(k => [k, { code: 'unrecognized_keys' }])))
  }
  const { actor, row } = await findAssetForActor(event, kind, id)
  requireActorCan(actor, 'asset.edit', row.siteId)
  const current = Object.fromEntries(fieldKeys.map(k => [k, row[k]]))
  const merged = assetCreateSchemas[kind].safeParse({ ...current, ...patch })
  if (!merged.success) throw schemaFieldsError(merged.error)
  const values = merged.data as Record<string, unknown>
  refuseRuleProblems(assetRuleProblems(kind, { ...values, status: patch.status }, await siteAreaKinds(row.siteId), row))
  const revived = reviveCondemned(actor, kind, row, patch.status, statusReason)
  try {
    return await useDb().transaction(async (tx) => {
      const [updated] = await tx.update(cfg.table).set(values as never)
        .where(and(eq(cfg.table.id, id), eq(cfg.table.siteId, row.siteId))).returning()
      if (!updated) throw noSuchAsset(kind)
      await writeAudit(tx, { actor, siteId: row.siteId, action: revived ? 'uncondemn' : 'update', entity: kind, entityId: id, before: row, after: updated, note: revived })
      await recomputeSubjects(tx, row.siteId, await registrySubjects(tx, kind, row))
      return { item: updated }
    })
  }
  catch (error) {
    conflict(kind, values, error)
  }
}

// Out-of-service hold or release, with its reason, as an event and on the asset.
export async function setAssetOutOfService(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, outOfServiceSchema)
  const { actor, row } = await findAssetForActor(event, kind, id)
  if (!cfg.holdable) throw codedError(400, 'not_holdable', `An ${cfg.noun} cannot be put out of service.`)
  requireActorCan(actor, 'asset.hold', row.siteId)
  if (row.outOfService === body.outOfService) {
    throw body.outOfService ? codedError(409, 'already_out_of_service', `This ${cfg.noun} is already out of service.`) : codedError(409, 'already_in_service', `This ${cfg.noun} is already in service.`)
  }
  return useDb().transaction(async (tx) => {
    const t = cfg.table as typeof tables.batteries
    const [updated] = await tx.update(t)
      .set({ outOfService: body.outOfService, outOfServiceReason: body.outOfService ? body.reason : null })
      .where(and(eq(t.id, id), eq(t.outOfService, !body.outOfService))).returning()
    if (!updated) throw codedError(409, 'changed_same_moment', 'Someone changed this record at the same moment; reload and try again.')
    await tx.insert(tables.assetHolds).values({
      siteId: row.siteId, userId: actor.user.id, assetKind: kind, assetId: id,
      action: body.outOfService ? 'hold' : 'release', reason: body.reason || 'Released',
    })
    await writeAudit(tx, { actor, siteId: row.siteId, action: body.outOfService ? 'out_of_service' : 'return_to_service', entity: kind, entityId: id, before: { outOfService: row.outOfService }, after: { outOfService: body.outOfService, reason: body.reason }, note: body.reason })
    await recomputeSubjects(tx, row.siteId, await registrySubjects(tx, kind, row))
    return { item: updated }
  })
}
