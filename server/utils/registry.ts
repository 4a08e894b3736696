import type { H3Event } from 'h3'
import { z } from 'zod'
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import type { SQL } from 'drizzle-orm'
import type { AssetKind, ListQuery } from '#shared/utils/asset-schemas'
import {
  AREA_KINDS, BATTERY_CHEMISTRIES, CYLINDER_SPECS, CYLINDER_STATUSES, TRUCK_POWERS,
  assetCreateSchemas, assetFieldSchemas, idParamsSchema, listQuerySchema, outOfServiceSchema,
} from '#shared/utils/asset-schemas'

const bool = z.enum(['true', 'false']).transform(v => v === 'true')
const intParam = z.coerce.number().int()

interface KindConfig {
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
}

function kinds(): Record<AssetKind, KindConfig> {
  const { trucks: t, batteries: b, chargers: c, lpCylinders: l, areas: a } = tables
  return {
    truck: {
      table: t, noun: 'truck', identity: 'fleetNumber', defaultSort: 'fleetNumber',
      sortable: { fleetNumber: t.fleetNumber, truckClass: t.truckClass, power: t.power, systemVoltage: t.systemVoltage, hourMeter: t.hourMeter, createdAt: t.createdAt },
      search: [t.fleetNumber, t.model],
      filters: {
        power: { schema: z.enum(TRUCK_POWERS), column: t.power },
        truckClass: { schema: intParam.min(1).max(7), column: t.truckClass },
        homeAreaId: { schema: z.uuid(), column: t.homeAreaId },
        outOfService: { schema: bool, column: t.outOfService },
      },
      areaRefs: { homeAreaId: null }, holdable: true,
    },
    battery: {
      table: b, noun: 'battery', identity: 'serial', defaultSort: 'serial',
      sortable: { serial: b.serial, voltage: b.voltage, capacityAh: b.capacityAh, chemistry: b.chemistry, weightLb: b.weightLb, cycleCount: b.cycleCount, inServiceOn: b.inServiceOn, createdAt: b.createdAt },
      search: [b.serial, b.connector],
      filters: {
        chemistry: { schema: z.enum(BATTERY_CHEMISTRIES), column: b.chemistry },
        voltage: { schema: intParam.min(1).max(200), column: b.voltage },
        homeAreaId: { schema: z.uuid(), column: b.homeAreaId },
        outOfService: { schema: bool, column: b.outOfService },
      },
      areaRefs: { homeAreaId: 'charging_area' }, holdable: true,
    },
    charger: {
      table: c, noun: 'charger', identity: 'name', defaultSort: 'name',
      sortable: { name: c.name, outputVoltage: c.outputVoltage, maxCurrentA: c.maxCurrentA, chargerType: c.chargerType, createdAt: c.createdAt },
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
      sortable: { serial: l.serial, status: l.status, waterCapacityLb: l.waterCapacityLb, manufactureYear: l.manufactureYear, lastRequalifiedOn: l.lastRequalifiedOn, createdAt: l.createdAt },
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
      sortable: { name: a.name, kind: a.kind, createdAt: a.createdAt },
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
function liveTagCode(kind: AssetKind, table: PgTable) {
  return sql<string | null>`(SELECT code FROM tags WHERE tags.asset_kind = ${kind} AND tags.asset_id = ${table}.id AND tags.retired_at IS NULL)`
}

// The WHERE and ORDER BY of an asset list from its query (?siteId, q, sort, dir and the kind's filters).
function listConditions(event: H3Event, kind: AssetKind, query: ListQuery) {
  const cfg = assetKinds()[kind]
  const raw = getQuery(event)
  const where: SQL[] = [eq(cfg.table.siteId, query.siteId)]
  for (const [name, f] of Object.entries(cfg.filters)) {
    if (raw[name] === undefined || raw[name] === '') continue
    const parsed = f.schema.safeParse(raw[name])
    if (!parsed.success) throw createError({ statusCode: 400, message: `Check the filter "${name}".`, data: { fields: { [name]: parsed.error.issues[0]?.message ?? 'Not valid.' } } })
    where.push(eq(f.column, parsed.data as never))
  }
  if (query.q) {
    const like = `%${query.q.replace(/[\\%_]/g, m => `\\${m}`)}%`
    where.push(or(...cfg.search.map(col => ilike(col, like)), sql`${liveTagCode(kind, cfg.table)} ILIKE ${like}`)!)
  }
  // only the kind's own sort keys: `constructor`, `__proto__` and other names every object answers to are refused
  if (query.sort && !Object.hasOwn(cfg.sortable, query.sort)) {
    throw createError({ statusCode: 400, message: `Sort by one of: ${Object.keys(cfg.sortable).join(', ')}.`, data: { fields: { sort: 'Not a column this list sorts by.' } } })
  }
  const sortKey = query.sort ?? cfg.defaultSort
  const sortCol = cfg.sortable[sortKey]!
  return { condition: and(...where), sortKey, order: [query.dir === 'desc' ? desc(sortCol) : asc(sortCol), asc(cfg.table.id)] }
}

// Server-side paged, sorted, filtered list of one asset kind at one site.
export async function listAssets(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const query = validateQuery(event, listQuerySchema)
  await requireAbility(event, 'site.member', query.siteId)
  const { condition, sortKey, order } = listConditions(event, kind, query)
  const db = useDb()
  const [items, [{ total } = { total: 0 }]] = await Promise.all([
    db.select({ row: cfg.table, tagCode: liveTagCode(kind, cfg.table) })
      .from(cfg.table as PgTable)
      .where(condition)
      .orderBy(...order)
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ total: count() }).from(cfg.table as PgTable).where(condition),
  ])
  return {
    items: items.map(i => ({ ...(i.row as Record<string, unknown>), tagCode: i.tagCode })),
    total: Number(total),
    page: query.page,
    pageSize: query.pageSize,
    sort: sortKey,
    dir: query.dir,
  }
}

// The whole filtered list as CSV (the same query as the list, without paging).
export async function exportAssets(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const query = validateQuery(event, listQuerySchema)
  await requireAbility(event, 'site.member', query.siteId)
  const { condition, order } = listConditions(event, kind, query)
  const rows = await useDb().select({ row: cfg.table, tagCode: liveTagCode(kind, cfg.table) })
    .from(cfg.table as PgTable).where(condition).orderBy(...order).limit(200_000)
  const { byId } = await areaNames(query.siteId)
  const csv = toCsv(kind, rows.map(r => ({ ...(r.row as Record<string, unknown>), tagCode: r.tagCode })), byId)
  return sendCsv(event, `bayward-${kind}-list-${new Date().toISOString().slice(0, 10)}.csv`, csv)
}

// Finds one asset by id among the sites the user belongs to; anything else is 404.
export async function findAssetForActor(event: H3Event, kind: AssetKind, id: string) {
  const actor = await requireActor(event)
  const cfg = assetKinds()[kind]
  if (actor.siteIds.length === 0) throw createError({ statusCode: 404, message: `No such ${cfg.noun}.` })
  const [found] = await useDb()
    .select({ row: cfg.table, tagCode: liveTagCode(kind, cfg.table) })
    .from(cfg.table as PgTable)
    .where(and(eq(cfg.table.id, id), inArray(cfg.table.siteId, actor.siteIds)))
  if (!found) throw createError({ statusCode: 404, message: `No such ${cfg.noun}.` })
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
    throw createError({
      statusCode: 409,
      message: `A ${cfg.noun} "${String(values[cfg.identity])}" already exists at this site.`,
      data: { fields: { [cfg.identity]: 'Already used at this site.' } },
    })
  }
  throw error
}

const createBody = z.object({ siteId: z.uuid('Pick a site.') }).loose()

export async function createAsset(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const { siteId, ...rest } = await validateBody(event, createBody)
  const actor = await requireAbility(event, 'asset.edit', siteId)
  const parsed = assetCreateSchemas[kind].safeParse(rest)
  if (!parsed.success) {
    const fields = fieldMessages(parsed.error)
    throw createError({ statusCode: 400, message: 'Check the highlighted fields.', data: { fields } })
  }
  const values = parsed.data as Record<string, unknown>
  refuseRuleProblems(assetRuleProblems(kind, values, await siteAreaKinds(siteId)))
  try {
    return await useDb().transaction(async (tx) => {
      const [row] = await tx.insert(cfg.table).values({ ...values, siteId } as never).returning()
      const created = row as Record<string, unknown> & { id: string }
      const tagCode = await issueTag(tx, kind, created.id, siteId)
      await writeAudit(tx, { actor, siteId, action: 'create', entity: kind, entityId: created.id, after: created })
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
  if (unknown.length) throw createError({ statusCode: 400, message: `Unknown field: ${unknown.join(', ')}.`, data: { fields: Object.fromEntries(unknown.map(k => [k, 'Not a field of this record.'])) } })
  const { actor, row } = await findAssetForActor(event, kind, id)
  requireActorCan(actor, 'asset.edit', row.siteId)
  const current = Object.fromEntries(fieldKeys.map(k => [k, row[k]]))
  const merged = assetCreateSchemas[kind].safeParse({ ...current, ...patch })
  if (!merged.success) throw createError({ statusCode: 400, message: 'Check the highlighted fields.', data: { fields: fieldMessages(merged.error) } })
  const values = merged.data as Record<string, unknown>
  refuseRuleProblems(assetRuleProblems(kind, { ...values, status: patch.status }, await siteAreaKinds(row.siteId), row))
  const revived = reviveCondemned(actor, kind, row, patch.status, statusReason)
  try {
    return await useDb().transaction(async (tx) => {
      const [updated] = await tx.update(cfg.table).set(values as never)
        .where(and(eq(cfg.table.id, id), eq(cfg.table.siteId, row.siteId))).returning()
      if (!updated) throw createError({ statusCode: 404, message: `No such ${cfg.noun}.` })
      await writeAudit(tx, { actor, siteId: row.siteId, action: revived ? 'uncondemn' : 'update', entity: kind, entityId: id, before: row, after: updated, note: revived })
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
  if (!cfg.holdable) throw createError({ statusCode: 400, message: `An ${cfg.noun} cannot be put out of service.` })
  requireActorCan(actor, 'asset.hold', row.siteId)
  if (row.outOfService === body.outOfService) {
    throw createError({ statusCode: 409, message: body.outOfService ? `This ${cfg.noun} is already out of service.` : `This ${cfg.noun} is already in service.` })
  }
  return useDb().transaction(async (tx) => {
    const t = cfg.table as typeof tables.batteries
    const [updated] = await tx.update(t)
      .set({ outOfService: body.outOfService, outOfServiceReason: body.outOfService ? body.reason : null })
      .where(and(eq(t.id, id), eq(t.outOfService, !body.outOfService))).returning()
    if (!updated) throw createError({ statusCode: 409, message: 'Someone changed this record at the same moment; reload and try again.' })
    await tx.insert(tables.assetHolds).values({
      siteId: row.siteId, userId: actor.user.id, assetKind: kind, assetId: id,
      action: body.outOfService ? 'hold' : 'release', reason: body.reason || 'Released',
    })
    await writeAudit(tx, { actor, siteId: row.siteId, action: body.outOfService ? 'out_of_service' : 'return_to_service', entity: kind, entityId: id, before: { outOfService: row.outOfService }, after: { outOfService: body.outOfService, reason: body.reason }, note: body.reason })
    return { item: updated }
  })
}
