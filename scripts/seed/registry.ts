import { HOUR_MS } from './clock'
import type { SeedContext } from './context'
import type { Fleet } from './fleet'
import type { AreaRow, BatteryRow, ChargerRow, CylinderRow, TruckRow } from './rows'

type AssetKind = 'battery' | 'charger' | 'cylinder' | 'truck' | 'area'

const PREFIX: Record<AssetKind, string> = { battery: 'B', charger: 'C', cylinder: 'L', truck: 'T', area: 'A' }

// One live tag per asset, numbered per prefix in creation order, and one audit 'create' row each.
export function writeTagsAndAudit(ctx: SeedContext, assets: { areas: AreaRow[], trucks: TruckRow[], batteries: BatteryRow[], chargers: ChargerRow[], cylinders: CylinderRow[] }) {
  const { rows, rand } = ctx
  const groups: Array<[AssetKind, Array<AreaRow | TruckRow | BatteryRow | ChargerRow | CylinderRow>]> = [
    ['area', assets.areas],
    ['truck', assets.trucks],
    ['battery', assets.batteries],
    ['charger', assets.chargers],
    ['cylinder', assets.cylinders],
  ]
  // Labels not printed yet: two spare batteries, a charger and two cylinders.
  const unprinted = new Set([
    assets.batteries.at(-1)!.id,
    assets.batteries.at(-3)!.id,
    assets.chargers.at(-1)!.id,
    assets.cylinders.at(-2)!.id,
    assets.cylinders.at(-9)!.id,
  ])
  let minute = 0
  for (const [kind, list] of groups) {
    list.forEach((asset, i) => {
      minute += 1
      const createdAt = new Date(ctx.registeredAt.getTime() + minute * 60_000)
      asset.createdAt = createdAt
      asset.updatedAt = createdAt
      rows.tags.push({
        id: ctx.newId(),
        code: `${PREFIX[kind]}-${String(i + 1).padStart(5, '0')}`,
        assetKind: kind,
        assetId: asset.id,
        siteId: asset.siteId,
        issuedAt: createdAt,
        printedAt: unprinted.has(asset.id) ? null : new Date(createdAt.getTime() + rand.int(20, 72) * HOUR_MS),
      })
      rows.auditLog.push({ at: createdAt, userId: ctx.adminId, siteId: asset.siteId, action: 'create', entity: kind, entityId: asset.id, after: { ...asset } })
    })
    rows.tagCounters.push({ prefix: PREFIX[kind], last: list.length })
  }
}

// Out-of-service holds on the two spare batteries, with the matching audit rows.
export function writeBatteryHolds(ctx: SeedContext, fleet: Fleet, heldAt: Map<string, Date>) {
  for (const b of fleet.batteries) {
    const at = heldAt.get(b.row.id)
    const reason = b.plan?.reason
    if (!at || !reason) continue
    const site = b.row.siteId === ctx.sites.mb.id ? ctx.sites.mb : ctx.sites.fx
    b.row.outOfService = true
    b.row.outOfServiceReason = reason
    ctx.rows.assetHolds.push({ id: ctx.newId(), siteId: b.row.siteId, userId: site.people.technician, at, recordedAt: at, assetKind: 'battery', assetId: b.row.id, action: 'hold', reason })
    ctx.rows.auditLog.push({ at, userId: site.people.technician, siteId: b.row.siteId, action: 'out_of_service', entity: 'battery', entityId: b.row.id, before: { outOfService: false }, after: { outOfService: true, reason }, note: reason })
  }
}
