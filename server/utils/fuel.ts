import type { H3Event } from 'h3'
import type { SiteSettings } from '#shared/utils/site-settings'
import type { RefillInput } from '#shared/utils/fuel-schemas'
import type { DbOrTx } from './db'
import type { Actor } from './auth'

export type FuelCylinderRow = typeof tables.lpCylinders.$inferSelect
export type FuelTruckRow = typeof tables.trucks.$inferSelect

export const COMBUSTION_POWERS = ['lp_gas', 'gasoline', 'diesel'] as const

export function isCombustionPower(power: string): power is (typeof COMBUSTION_POWERS)[number] {
  return (COMBUSTION_POWERS as readonly string[]).includes(power)
}

/** Requalification due within this many days shows in the cage (issue 5: "the next 90 days"). */
export const CAGE_REQUALIFICATION_WINDOW_DAYS = 90

export interface FuelSiteFacts {
  id: string
  name: string
  timeZone: string
  settings: SiteSettings
  /** today's calendar date at the site */
  today: string
}

// The site's policy and today's date in its time zone; settings are re-read through the schema so
// keys added after the site was created take their defaults.
export async function fuelSiteFacts(db: DbOrTx, siteId: string): Promise<FuelSiteFacts> {
  const [site] = await db.select({ id: tables.sites.id, name: tables.sites.name, timeZone: tables.sites.timeZone, settings: tables.sites.settings })
    .from(tables.sites).where(eq(tables.sites.id, siteId))
  if (!site) throw createError({ statusCode: 404, message: 'No such site.' })
  return { ...site, settings: siteSettingsSchema.parse(site.settings ?? {}), today: localDate(new Date(), site.timeZone) }
}

export interface CylinderRequalificationState {
  dueOn: string
  status: 'current' | 'due_soon' | 'overdue'
  daysLeft: number
}

export function cylinderRequalification(cylinder: FuelCylinderRow, facts: FuelSiteFacts): CylinderRequalificationState {
  const dueOn = cylinderRequalificationDue(cylinder, requalificationYearsFromSettings(facts.settings))
  return { dueOn, ...requalificationStatus(dueOn, facts.today, CAGE_REQUALIFICATION_WINDOW_DAYS) }
}

export interface LpTransferStanding {
  current: boolean
  expiresOn: string | null
}

// The user's LP-gas transfer qualification on the site's today (in date through its expiry day).
export async function lpTransferStanding(db: DbOrTx, userId: string, today: string): Promise<LpTransferStanding> {
  const rows = await db.select({ expiresOn: tables.qualifications.expiresOn }).from(tables.qualifications)
    .where(and(eq(tables.qualifications.userId, userId), eq(tables.qualifications.kind, 'lp_gas_transfer')))
    .orderBy(desc(tables.qualifications.expiresOn))
    .limit(1)
  const expiresOn = rows[0]?.expiresOn ?? null
  return { current: !!expiresOn && expiresOn >= today, expiresOn }
}

export function lpTransferRefusal(standing: LpTransferStanding): string | null {
  if (standing.current) return null
  return standing.expiresOn
    ? `Your LP-gas transfer qualification expired on ${standing.expiresOn}. Only people with a current one may refill cylinders; ask your safety lead to record your retraining.`
    : 'Only people trained for LP-gas transfer may refill cylinders, and there is no LP-gas transfer qualification on your record. Ask your safety lead.'
}

// Reasons the cylinder's own state forbids a fill (answered 409): condemned, quarantined, out of
// service, on a truck, or past its requalification date.
export async function cylinderFillBlocks(db: DbOrTx, cylinder: FuelCylinderRow, facts: FuelSiteFacts): Promise<string[]> {
  const reasons: string[] = []
  if (cylinder.status === 'condemned') reasons.push('This cylinder is condemned and may never be filled again.')
  if (cylinder.status === 'quarantined') reasons.push(`This cylinder is quarantined${cylinder.outOfServiceReason ? `: ${cylinder.outOfServiceReason}` : ''}.`)
  else if (cylinder.outOfService) reasons.push(`This cylinder is out of service${cylinder.outOfServiceReason ? `: ${cylinder.outOfServiceReason}` : ''}.`)
  if (cylinder.status === 'in_use') {
    const truck = cylinder.currentTruckId ? await truckLabel(db, cylinder.currentTruckId) : 'a truck'
    reasons.push(`This cylinder is on ${truck}. Take it off the truck (a cylinder exchange) before refilling.`)
  }
  const requal = cylinderRequalification(cylinder, facts)
  if (requal.status === 'overdue') {
    reasons.push(`Requalification was due on ${requal.dueOn}. A cylinder past its requalification date cannot be filled until it is requalified.`)
  }
  return reasons
}

async function truckLabel(db: DbOrTx, truckId: string): Promise<string> {
  const [t] = await db.select({ fleetNumber: tables.trucks.fleetNumber }).from(tables.trucks).where(eq(tables.trucks.id, truckId))
  return t ? `truck ${t.fleetNumber}` : 'a truck'
}

// A cylinder at the site by tag code (live or retired) or by serial, as scanned or typed.
export async function findCylinderByCode(db: DbOrTx, siteId: string, raw: string): Promise<FuelCylinderRow | null> {
  const code = raw.trim()
  const tagCode = normalizeTagCode(code)
  if (tagCode) {
    const [tag] = await db.select({ assetId: tables.tags.assetId }).from(tables.tags)
      .where(and(eq(tables.tags.code, tagCode), eq(tables.tags.assetKind, 'cylinder'), eq(tables.tags.siteId, siteId)))
    if (tag) {
      const [row] = await db.select().from(tables.lpCylinders).where(and(eq(tables.lpCylinders.id, tag.assetId), eq(tables.lpCylinders.siteId, siteId)))
      if (row) return row
    }
  }
  const [bySerial] = await db.select().from(tables.lpCylinders)
    .where(and(eq(tables.lpCylinders.siteId, siteId), sql`lower(${tables.lpCylinders.serial}) = lower(${code})`))
  return bySerial ?? null
}

export async function liveCylinderTag(db: DbOrTx, cylinderId: string): Promise<string | null> {
  const [tag] = await db.select({ code: tables.tags.code }).from(tables.tags)
    .where(and(eq(tables.tags.assetKind, 'cylinder'), eq(tables.tags.assetId, cylinderId), isNull(tables.tags.retiredAt)))
  return tag?.code ?? null
}

export interface RefillOutcome {
  refill: typeof tables.cylinderRefills.$inferSelect
  cylinder: FuelCylinderRow
  /** 409: the cylinder's state forbids filling; 422: this fill failed its checks; 201: filled */
  status: 201 | 409 | 422 | 200
  reasons: string[]
  /** the technician should be offered to quarantine the cylinder */
  offerQuarantine: boolean
}

function inspectionFailures(inspection: RefillInput['inspection']): string[] {
  return PREFILL_INSPECTION_ITEMS.filter(i => inspection[i.key] === 'fail').map(i => i.label)
}

const lb = (v: number) => `${Math.round(v * 10) / 10} lb`

// One refill attempt, stored whether it passes or not. A refused attempt leaves the cylinder's status
// as it was; a passed one makes it full. The cylinder row is locked for the whole check.
export async function recordRefill(actor: Actor, cylinderId: string, input: RefillInput): Promise<RefillOutcome> {
  const db = useDb()
  return db.transaction(async (tx) => {
    const [cylinder] = await tx.select().from(tables.lpCylinders).where(eq(tables.lpCylinders.id, cylinderId)).for('update')
    if (!cylinder) throw createError({ statusCode: 404, message: 'No such LP cylinder.' })
    if (input.idempotencyKey) {
      const [earlier] = await tx.select().from(tables.cylinderRefills).where(eq(tables.cylinderRefills.idempotencyKey, input.idempotencyKey))
      if (earlier) {
        if (earlier.cylinderId !== cylinderId || earlier.userId !== actor.user.id) throw createError({ statusCode: 409, message: 'That idempotency key was used for another record.' })
        return { refill: earlier, cylinder, status: 200 as const, reasons: earlier.refusalReasons, offerQuarantine: false }
      }
    }
    const at = eventTime(input.at, 'at')
    const facts = await fuelSiteFacts(tx, cylinder.siteId)
    const stateReasons = await cylinderFillBlocks(tx, cylinder, facts)
    const failed = inspectionFailures(input.inspection)
    const checkReasons: string[] = []
    if (failed.length) checkReasons.push(`Failed pre-fill inspection: ${failed.join('; ')}. Do not fill this cylinder.`)

    const sg = input.productSg ?? PROPANE_DEFAULT_SG
    let fill: FillAssessment | null = null
    if (input.grossBeforeLb !== null && input.grossAfterLb !== null) {
      const assessed = assessFill({ waterCapacityLb: cylinder.waterCapacityLb, tareLb: cylinder.tareLb, grossBeforeLb: input.grossBeforeLb, grossAfterLb: input.grossAfterLb, sg })
      if (!assessed.ok) {
        const fields = Object.fromEntries(assessed.errors.map(e => [e.field === 'sg' ? 'productSg' : e.field, e.message]))
        throw createError({ statusCode: 400, message: assessed.errors[0]!.message, data: { fields } })
      }
      fill = assessed
      if (assessed.overfilled) {
        const percent = maxFillingDensityPercent(sg)
        checkReasons.push(`Overfilled by ${lb(assessed.overfillLb)}: the limit is ${lb(assessed.fillLimitLb)} (water capacity ${lb(cylinder.waterCapacityLb)} × ${percent} %). Remove the excess before the cylinder leaves the station, then weigh it again.`)
      }
    }
    let tareFlagged = false
    if (input.measuredTareLb !== null) {
      if (input.measuredTareLb <= 0) throw createError({ statusCode: 400, message: 'Measured tare must be above 0.', data: { fields: { measuredTareLb: 'Above 0 lb.' } } })
      tareFlagged = tareLossFlagsRequalification(cylinder.tareLb, input.measuredTareLb)
      if (tareFlagged) {
        const loss = (cylinder.tareLb - input.measuredTareLb) / cylinder.tareLb * 100
        checkReasons.push(`Measured tare ${lb(input.measuredTareLb)} is ${loss.toFixed(1)} % below the stamped ${lb(cylinder.tareLb)} (${TARE_LOSS_REQUALIFICATION_PERCENT} % or more): send the cylinder for requalification before filling.`)
      }
    }
    const reasons = [...stateReasons, ...checkReasons]
    const refused = reasons.length > 0
    const [refill] = await tx.insert(tables.cylinderRefills).values({
      siteId: cylinder.siteId,
      userId: actor.user.id,
      cylinderId,
      at,
      idempotencyKey: input.idempotencyKey ?? null,
      note: input.note,
      inspection: input.inspection,
      refused,
      refusalReasons: reasons,
      grossBeforeLb: input.grossBeforeLb,
      grossAfterLb: input.grossAfterLb,
      measuredTareLb: input.measuredTareLb,
      productSg: sg,
      netAddedLb: fill?.netAddedLb ?? null,
      fillLimitLb: fill?.fillLimitLb ?? fillLimitLb(cylinder.waterCapacityLb, sg),
      overfilled: fill?.overfilled ?? false,
      gallonsAt60F: fill?.gallonsAt60F ?? null,
      tareFlagged,
    }).returning()
    let after = cylinder
    if (!refused) {
      const [updated] = await tx.update(tables.lpCylinders).set({ status: 'full', statusChangedAt: new Date() })
        .where(eq(tables.lpCylinders.id, cylinderId)).returning()
      after = updated!
    }
    await writeAudit(tx, {
      actor, siteId: cylinder.siteId, action: refused ? 'refill_refused' : 'refill', entity: 'cylinder_refill', entityId: refill!.id,
      after: refill, note: refused ? reasons.join(' ') : undefined,
    })
    // the safety leads hear of a refused cylinder at once (queued with the record, sent after the answer)
    if (refused) {
      const [tag] = await tx.select({ code: tables.tags.code }).from(tables.tags)
        .where(and(eq(tables.tags.assetKind, 'cylinder'), eq(tables.tags.assetId, cylinderId), isNull(tables.tags.retiredAt)))
      await notifyRefusedCylinder(tx, { siteId: cylinder.siteId, cylinderId, code: tag?.code ?? cylinder.serial, reasons, by: actor.user.name })
    }
    return {
      refill: refill!,
      cylinder: after,
      status: refused ? (stateReasons.length ? 409 : 422) : 201,
      reasons,
      offerQuarantine: refused && (failed.length > 0 || tareFlagged) && cylinder.status !== 'condemned' && cylinder.status !== 'quarantined',
    }
  })
}

// Quarantine: the cylinder is set aside in the cage (status quarantined, out of service) with a hold.
export async function quarantineCylinder(actor: Actor, cylinder: FuelCylinderRow, reason: string) {
  if (cylinder.status === 'condemned') throw createError({ statusCode: 409, message: 'This cylinder is condemned already.' })
  if (cylinder.status === 'quarantined') throw createError({ statusCode: 409, message: 'This cylinder is quarantined already.' })
  if (cylinder.status === 'in_use') throw createError({ statusCode: 409, message: 'This cylinder is on a truck. Take it off the truck first (a cylinder exchange).' })
  return useDb().transaction(async (tx) => {
    const [updated] = await tx.update(tables.lpCylinders)
      .set({ status: 'quarantined', outOfService: true, outOfServiceReason: reason, statusChangedAt: new Date() })
      .where(and(eq(tables.lpCylinders.id, cylinder.id), eq(tables.lpCylinders.status, cylinder.status))).returning()
    if (!updated) throw createError({ statusCode: 409, message: 'Someone changed this cylinder at the same moment; reload and try again.' })
    await tx.insert(tables.assetHolds).values({ siteId: cylinder.siteId, userId: actor.user.id, assetKind: 'cylinder', assetId: cylinder.id, action: 'hold', reason })
    await writeAudit(tx, {
      actor, siteId: cylinder.siteId, action: 'out_of_service', entity: 'cylinder', entityId: cylinder.id,
      before: { status: cylinder.status, outOfService: cylinder.outOfService }, after: { status: 'quarantined', outOfService: true, reason }, note: `Quarantined: ${reason}`,
    })
    return updated
  })
}

// Why a cylinder may not go on a truck; empty when it may.
export function cylinderMountBlocks(cylinder: FuelCylinderRow, facts: FuelSiteFacts, code: string): string[] {
  const name = `Cylinder ${code}`
  const reasons: string[] = []
  if (cylinder.status === 'condemned') reasons.push(`${name} is condemned.`)
  else if (cylinder.status === 'quarantined') reasons.push(`${name} is quarantined${cylinder.outOfServiceReason ? `: ${cylinder.outOfServiceReason}` : ''}.`)
  else if (cylinder.outOfService) reasons.push(`${name} is out of service${cylinder.outOfServiceReason ? `: ${cylinder.outOfServiceReason}` : ''}.`)
  if (cylinder.status === 'in_use') reasons.push(`${name} is already on a truck.`)
  if (cylinder.status === 'empty') reasons.push(`${name} is empty. Take a full cylinder from the cage.`)
  const requal = cylinderRequalification(cylinder, facts)
  if (requal.status === 'overdue') reasons.push(`${name} was due for requalification on ${requal.dueOn} and may not be used.`)
  return reasons
}

interface ExchangeRequest {
  truck: FuelTruckRow
  cylinderOnId: string
  cylinderOffId: string | null
  /** when Save was pressed, for a record sent late */
  at?: string
  idempotencyKey?: string
  note: string
}

// A cylinder change on an LP-gas truck in one transaction: the truck and both cylinders are locked,
// the one coming off goes to the cage as empty, the one going on is in use on the truck.
export async function recordExchange(actor: Actor, req: ExchangeRequest) {
  const { truck } = req
  return useDb().transaction(async (tx) => {
    // the truck lock first, so a copy of the same request sent at once finds the first one's row
    await tx.select({ id: tables.trucks.id }).from(tables.trucks).where(eq(tables.trucks.id, truck.id)).for('update')
    if (req.idempotencyKey) {
      const [earlier] = await tx.select().from(tables.cylinderExchanges).where(eq(tables.cylinderExchanges.idempotencyKey, req.idempotencyKey))
      if (earlier) {
        if (earlier.truckId !== truck.id || earlier.userId !== actor.user.id) throw createError({ statusCode: 409, message: 'That idempotency key was used for another record.' })
        return { exchange: earlier, repeated: true }
      }
    }
    const at = eventTime(req.at, 'at')
    const ids = [...new Set([req.cylinderOnId, req.cylinderOffId].filter((v): v is string => !!v))].sort()
    const locked = await tx.select().from(tables.lpCylinders)
      .where(and(inArray(tables.lpCylinders.id, ids), eq(tables.lpCylinders.siteId, truck.siteId)))
      .orderBy(asc(tables.lpCylinders.id)).for('update')
    const [current] = await tx.select().from(tables.lpCylinders).where(eq(tables.lpCylinders.currentTruckId, truck.id)).for('update')
    const on = locked.find(c => c.id === req.cylinderOnId)
    if (!on) throw createError({ statusCode: 400, message: 'Pick a cylinder at this site.', data: { fields: { cylinderOnCode: 'No such cylinder at this site.' } } })
    if ((current?.id ?? null) !== req.cylinderOffId) {
      const currentCode = current ? (await liveCylinderTag(tx, current.id)) ?? current.serial : null
      throw createError({
        statusCode: 409,
        message: current ? `Truck ${truck.fleetNumber} carries cylinder ${currentCode}; take that one off.` : `Truck ${truck.fleetNumber} has no cylinder on record; there is none to take off.`,
        data: { reasons: ['The cylinder coming off is not the one on record for this truck.'], currentCylinderId: current?.id ?? null },
      })
    }
    if (on.id === current?.id) throw createError({ statusCode: 400, message: 'The cylinder going on is the one already on the truck.', data: { fields: { cylinderOnCode: 'Already on this truck.' } } })
    const facts = await fuelSiteFacts(tx, truck.siteId)
    const onCode = (await liveCylinderTag(tx, on.id)) ?? on.serial
    const reasons = cylinderMountBlocks(on, facts, onCode)
    if (reasons.length) throw createError({ statusCode: 409, message: reasons[0]!, data: { reasons } })
    const now = new Date()
    if (current) {
      await tx.update(tables.lpCylinders).set({ status: 'empty', currentTruckId: null, statusChangedAt: now }).where(eq(tables.lpCylinders.id, current.id))
    }
    await tx.update(tables.lpCylinders).set({ status: 'in_use', currentTruckId: truck.id, statusChangedAt: now }).where(eq(tables.lpCylinders.id, on.id))
    const [exchange] = await tx.insert(tables.cylinderExchanges).values({
      siteId: truck.siteId, userId: actor.user.id, at, truckId: truck.id, cylinderOffId: current?.id ?? null, cylinderOnId: on.id,
      idempotencyKey: req.idempotencyKey ?? null, note: req.note,
    }).returning()
    await writeAudit(tx, { actor, siteId: truck.siteId, action: 'exchange', entity: 'cylinder_exchange', entityId: exchange!.id, after: exchange })
    return { exchange: exchange!, repeated: false }
  })
}

export interface CageCylinder {
  id: string
  serial: string
  tagCode: string | null
  status: FuelCylinderRow['status']
  outOfService: boolean
  nominalPropaneLb: number
  requalification: CylinderRequalificationState
  truckFleetNumber: string | null
}

export interface CageStation {
  areaId: string | null
  name: string
  counts: Record<FuelCylinderRow['status'], number>
  storedPropaneLb: number
  storage: LpStorageStanding
  requalificationDue: CageCylinder[]
  reorder: { below: boolean, full: number, reorderAt: number }
  cylinders: CageCylinder[]
}

// The Cylinder cage of each fuel station at a site (and cylinders assigned to no station).
export async function cylinderCage(siteId: string) {
  const db = useDb()
  const facts = await fuelSiteFacts(db, siteId)
  const stations = await db.select().from(tables.areas)
    .where(and(eq(tables.areas.siteId, siteId), eq(tables.areas.kind, 'fuel_station'), eq(tables.areas.archived, false)))
    .orderBy(asc(tables.areas.name))
  const l = tables.lpCylinders
  const rows = await db.select({
    id: l.id, serial: l.serial, status: l.status, outOfService: l.outOfService, nominalPropaneLb: l.nominalPropaneLb, areaId: l.areaId,
    manufactureYear: l.manufactureYear, manufactureMonth: l.manufactureMonth, lastRequalifiedOn: l.lastRequalifiedOn, lastRequalificationMethod: l.lastRequalificationMethod,
    tagCode: sql<string | null>`(SELECT code FROM tags WHERE tags.asset_kind = 'cylinder' AND tags.asset_id = ${l}.id AND tags.retired_at IS NULL)`,
    truckFleetNumber: sql<string | null>`(SELECT fleet_number FROM trucks WHERE trucks.id = ${l}.current_truck_id)`,
    // What the last refill left in a cylinder that has not moved since (a refused or partial fill).
    contentsLb: sql<number | null>`(SELECT GREATEST(0, COALESCE(r.gross_after_lb, r.gross_before_lb) - ${l}.tare_lb) FROM cylinder_refills r
      WHERE r.cylinder_id = ${l}.id AND r.at >= ${l}.status_changed_at ORDER BY r.at DESC LIMIT 1)`,
  }).from(l).where(eq(l.siteId, siteId)).orderBy(asc(l.serial))
  const cylinders = rows.map(r => ({ ...r, contentsLb: r.contentsLb === null ? null : Number(r.contentsLb) }))
  const years = requalificationYearsFromSettings(facts.settings)
  const groups: { areaId: string | null, name: string, limit: number | null }[] = stations.map(s => ({ areaId: s.id, name: s.name, limit: s.lpStorageLimitLb }))
  if (cylinders.some(c => !c.areaId || !stations.some(s => s.id === c.areaId))) groups.push({ areaId: null, name: 'No fuel station set', limit: null })
  const result: CageStation[] = groups.map((g) => {
    const mine = cylinders.filter(c => g.areaId ? c.areaId === g.areaId : (!c.areaId || !stations.some(s => s.id === c.areaId)))
    const counts = { full: 0, empty: 0, in_use: 0, quarantined: 0, condemned: 0 }
    for (const c of mine) counts[c.status] += 1
    const storedPropaneLb = cagePropaneLb(mine)
    const shown: CageCylinder[] = mine.map((c) => {
      const dueOn = cylinderRequalificationDue(c, years)
      return {
        id: c.id, serial: c.serial, tagCode: c.tagCode, status: c.status, outOfService: c.outOfService, nominalPropaneLb: c.nominalPropaneLb,
        truckFleetNumber: c.truckFleetNumber, requalification: { dueOn, ...requalificationStatus(dueOn, facts.today, CAGE_REQUALIFICATION_WINDOW_DAYS) },
      }
    })
    return {
      areaId: g.areaId,
      name: g.name,
      counts,
      storedPropaneLb,
      storage: lpStorageStanding(storedPropaneLb, g.limit),
      requalificationDue: shown.filter(c => c.status !== 'condemned' && c.requalification.status !== 'current')
        .sort((a, b) => a.requalification.dueOn.localeCompare(b.requalification.dueOn)),
      reorder: { below: counts.full < facts.settings.fullCylinderReorderAt, full: counts.full, reorderAt: facts.settings.fullCylinderReorderAt },
      cylinders: shown,
    }
  })
  return { siteId, today: facts.today, stations: result }
}

// After a requalification: passed → the next date by method from the site table; failed → condemned.
export async function recordRequalification(actor: Actor, cylinder: FuelCylinderRow, input: { performedOn: string, method: FuelCylinderRow['lastRequalificationMethod'] & string, marking: string, passed: boolean, note: string }) {
  return useDb().transaction(async (tx) => {
    const [locked] = await tx.select().from(tables.lpCylinders).where(eq(tables.lpCylinders.id, cylinder.id)).for('update')
    if (!locked) throw createError({ statusCode: 404, message: 'No such LP cylinder.' })
    const facts = await fuelSiteFacts(tx, locked.siteId)
    if (input.performedOn > facts.today) throw createError({ statusCode: 400, message: 'The requalification date is in the future.', data: { fields: { performedOn: 'Not after today.' } } })
    const made = `${locked.manufactureYear}-${String(locked.manufactureMonth).padStart(2, '0')}`
    if (input.performedOn.slice(0, 7) < made) throw createError({ statusCode: 400, message: 'The requalification date is before the cylinder was made.', data: { fields: { performedOn: `Not before ${made}.` } } })
    if (locked.status === 'condemned') throw createError({ statusCode: 409, message: 'This cylinder is condemned; it cannot be requalified.' })
    if (!input.passed && locked.status === 'in_use') throw createError({ statusCode: 409, message: 'This cylinder is on a truck. Take it off the truck first (a cylinder exchange).' })
    const suffix = REQUALIFICATION_MARK_SUFFIX[input.method]
    const marking = input.marking || `${input.performedOn.slice(5, 7)}-${input.performedOn.slice(2, 4)}${suffix ? ` ${suffix}` : ''}`
    if (suffix && !new RegExp(`\\b${suffix}\\b`).test(marking)) {
      throw createError({ statusCode: 400, message: `An ${REQUALIFICATION_METHOD_LABELS[input.method].toLowerCase()} is marked with "${suffix}" after the date.`, data: { fields: { marking: `Include "${suffix}" (49 CFR 180.209).` } } })
    }
    const nextDueOn = input.passed ? nextRequalificationDue(input.performedOn, input.method, requalificationYearsFromSettings(facts.settings)) : null
    const [row] = await tx.insert(tables.requalifications).values({
      siteId: locked.siteId, userId: actor.user.id, cylinderId: locked.id, performedOn: input.performedOn, method: input.method,
      marking, passed: input.passed, nextDueOn, note: input.note,
    }).returning()
    const newer = !locked.lastRequalifiedOn || input.performedOn >= locked.lastRequalifiedOn
    const patch: Partial<typeof tables.lpCylinders.$inferInsert> = input.passed
      ? (newer ? { lastRequalifiedOn: input.performedOn, lastRequalificationMethod: input.method } : {})
      : { status: 'condemned', outOfService: true, outOfServiceReason: `Condemned at requalification on ${input.performedOn}`, currentTruckId: null, statusChangedAt: new Date() }
    const [updated] = Object.keys(patch).length
      ? await tx.update(tables.lpCylinders).set(patch).where(eq(tables.lpCylinders.id, locked.id)).returning()
      : [locked]
    if (!input.passed) {
      await tx.insert(tables.assetHolds).values({ siteId: locked.siteId, userId: actor.user.id, assetKind: 'cylinder', assetId: locked.id, action: 'hold', reason: `Condemned at requalification on ${input.performedOn}` })
    }
    await writeAudit(tx, { actor, siteId: locked.siteId, action: input.passed ? 'requalification' : 'condemned', entity: 'requalification', entityId: row!.id, after: row })
    return { item: row!, cylinder: updated!, requalification: cylinderRequalification(updated!, facts) }
  })
}

export type EmissionsBucket = 'overdue' | 'failed' | 'due_30' | 'due_60' | 'due_90' | 'current'

// Where a combustion truck stands for its tailpipe test: overdue (or never tested), failed and awaiting
// its retest, due within 30 / 60 / 90 days, or current.
export function emissionsBucket(latest: { passed: boolean, nextDueOn: string } | null, today: string): { bucket: EmissionsBucket, daysLeft: number | null } {
  if (!latest) return { bucket: 'overdue', daysLeft: null }
  const daysLeft = calendarDaysBetween(today, latest.nextDueOn)
  if (daysLeft < 0) return { bucket: 'overdue', daysLeft }
  if (!latest.passed) return { bucket: 'failed', daysLeft }
  if (daysLeft <= 30) return { bucket: 'due_30', daysLeft }
  if (daysLeft <= 60) return { bucket: 'due_60', daysLeft }
  if (daysLeft <= 90) return { bucket: 'due_90', daysLeft }
  return { bucket: 'current', daysLeft }
}

export async function latestEmissionsTests(db: DbOrTx, truckIds: string[]) {
  if (truckIds.length === 0) return new Map<string, typeof tables.emissionsTests.$inferSelect>()
  const rows = await db.selectDistinctOn([tables.emissionsTests.truckId]).from(tables.emissionsTests)
    .where(inArray(tables.emissionsTests.truckId, truckIds))
    .orderBy(tables.emissionsTests.truckId, desc(tables.emissionsTests.testedOn), desc(tables.emissionsTests.recordedAt))
  return new Map(rows.map(r => [r.truckId, r]))
}

// The facilities view: every combustion truck at the given sites with its last test and bucket.
export async function emissionsOverview(siteIds: string[]) {
  const db = useDb()
  const sites = await Promise.all(siteIds.map(id => fuelSiteFacts(db, id)))
  const trucks = siteIds.length
    ? await db.select().from(tables.trucks)
        .where(and(inArray(tables.trucks.siteId, siteIds), inArray(tables.trucks.power, [...COMBUSTION_POWERS])))
        .orderBy(asc(tables.trucks.fleetNumber))
    : []
  const latest = await latestEmissionsTests(db, trucks.map(t => t.id))
  return {
    sites: sites.sort((a, b) => a.name.localeCompare(b.name)).map(s => ({
      id: s.id,
      name: s.name,
      today: s.today,
      policy: emissionsPolicyFromSettings(s.settings),
      trucks: trucks.filter(t => t.siteId === s.id).map((t) => {
        const last = latest.get(t.id) ?? null
        return {
          id: t.id, fleetNumber: t.fleetNumber, power: t.power, model: t.model, outOfService: t.outOfService,
          lastTest: last && { id: last.id, testedOn: last.testedOn, passed: last.passed, nextDueOn: last.nextDueOn, testerName: last.testerName, coIdlePct: last.coIdlePct, coHighIdlePct: last.coHighIdlePct, reasons: last.reasons, certificateUploadId: last.certificateUploadId },
          ...emissionsBucket(last, s.today),
        }
      }),
    })),
  }
}

type CoCeilingListener = (alert: { siteId: string, areaId: string, areaName: string, takenOn: string, peakPpm: number, ceilingPpm: number, readingIds: string[] }) => Promise<void> | void
const coCeilingListeners: CoCeilingListener[] = []

// The alert hook for a CO reading above the 200 ppm NIOSH ceiling: the mail module registers here.
export function onCoCeilingExceeded(listener: CoCeilingListener) {
  coCeilingListeners.push(listener)
}

export async function notifyCoCeilingExceeded(alert: Parameters<CoCeilingListener>[0]) {
  for (const listener of coCeilingListeners) {
    try {
      await listener(alert)
    }
    catch (error) {
      console.error('CO ceiling alert listener failed', error)
    }
  }
}

// A day of readings in one area, judged: TWA by 29 CFR 1910.1000(d)(1)(i) against the limits.
export function coDayAssessment(readings: { ppm: number, durationHours: number }[], siteLimitPpm: number) {
  return assessCoExposure(readings.map(r => ({ ppm: r.ppm, hours: r.durationHours })), { siteLimitPpm })
}

export async function requireCombustionTruck(event: H3Event, id: string) {
  const { actor, row } = await findAssetForActor(event, 'truck', id)
  return { actor, truck: row as unknown as FuelTruckRow }
}

/** The three CO lines a day is compared with, each with its source. */
export function coLimitsFor(siteLimitPpm: number) {
  return {
    oshaPel: CO_LIMITS.oshaPel,
    site: { ppm: siteLimitPpm, source: siteLimitPpm === CO_LIMITS.nioshRel.ppm ? `Site limit (${CO_LIMITS.nioshRel.source})` : 'Site limit (site policy)' },
    ceiling: CO_LIMITS.nioshCeiling,
  }
}
