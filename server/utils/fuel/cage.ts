import type { Actor } from '../auth'

// Quarantine: the cylinder is set aside in the cage (status quarantined, out of service) with a hold.
export async function quarantineCylinder(actor: Actor, cylinder: FuelCylinderRow, reason: string) {
  if (cylinder.status === 'condemned') throw codedError(409, 'cylinder_condemned_already', 'This cylinder is condemned already.')
  if (cylinder.status === 'quarantined') throw codedError(409, 'cylinder_quarantined_already', 'This cylinder is quarantined already.')
  if (cylinder.status === 'in_use') throw codedError(409, 'requal_on_truck', 'This cylinder is on a truck. Take it off the truck first (a cylinder exchange).')
  return useDb().transaction(async (tx) => {
    const [updated] = await tx.update(tables.lpCylinders)
      .set({ status: 'quarantined', outOfService: true, outOfServiceReason: reason, statusChangedAt: new Date() })
      .where(and(eq(tables.lpCylinders.id, cylinder.id), eq(tables.lpCylinders.status, cylinder.status))).returning()
    if (!updated) throw codedError(409, 'cylinder_changed_same_moment', 'Someone changed this cylinder at the same moment; reload and try again.')
    await tx.insert(tables.assetHolds).values({ siteId: cylinder.siteId, userId: actor.user.id, assetKind: 'cylinder', assetId: cylinder.id, action: 'hold', reason })
    await recomputeSubjects(tx, cylinder.siteId, [{ kind: 'cylinder', id: cylinder.id }], { lock: false })
    await writeAudit(tx, {
      actor, siteId: cylinder.siteId, action: 'out_of_service', entity: 'cylinder', entityId: cylinder.id,
      before: { status: cylinder.status, outOfService: cylinder.outOfService }, after: { status: 'quarantined', outOfService: true, reason }, note: `Quarantined: ${reason}`,
    })
    return updated
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
    .orderBy(asc(natural(tables.areas.name)))
  const l = tables.lpCylinders
  const rows = await db.select({
    id: l.id, serial: l.serial, status: l.status, outOfService: l.outOfService, nominalPropaneLb: l.nominalPropaneLb, areaId: l.areaId,
    manufactureYear: l.manufactureYear, manufactureMonth: l.manufactureMonth, lastRequalifiedOn: l.lastRequalifiedOn, lastRequalificationMethod: l.lastRequalificationMethod,
    tagCode: sql<string | null>`(SELECT code FROM tags WHERE tags.asset_kind = 'cylinder' AND tags.asset_id = ${l}.id AND tags.retired_at IS NULL)`,
    truckFleetNumber: sql<string | null>`(SELECT fleet_number FROM trucks WHERE trucks.id = ${l}.current_truck_id)`,
    // What the last refill left in a cylinder that has not moved since (a refused or partial fill).
    contentsLb: sql<number | null>`(SELECT GREATEST(0, COALESCE(r.gross_after_lb, r.gross_before_lb) - ${l}.tare_lb) FROM cylinder_refills r
      WHERE r.cylinder_id = ${l}.id AND r.at >= ${l}.status_changed_at ORDER BY r.at DESC LIMIT 1)`,
  }).from(l).where(eq(l.siteId, siteId)).orderBy(asc(natural(l.serial)))
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
