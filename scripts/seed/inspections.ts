import { DEFAULT_INSPECTION_ITEMS, DEFAULT_INSPECTION_TITLES, INSPECTION_POWERS, criticalFailures, inspectionPowerOf } from '../../shared/utils/truck-inspection'
import { shiftStartedAt } from '../../shared/utils/shift-times'
import { parseSiteSettings } from '../../shared/utils/site-settings'
import type { SeedContext } from './context'
import { MINUTE_MS, SITE_TIME_ZONE } from './clock'
import type { TruckRow } from './rows'

// Pre-shift checks: both checklists (version 1) at every site, the check of most trucks in service at the start
// of the shift the seed runs in (the sites' default shift starts), by the site's operator, one truck a minor
// failure, and one held since yesterday for a failed brake. A check placed after the seed's moment (the first
// minutes of a shift) is left out: that truck is then one not checked yet.
export function writeInspections(ctx: SeedContext, trucks: TruckRow[]) {
  const { clock, rows, newId } = ctx
  const shiftStart = shiftStartedAt(clock.now, parseSiteSettings({}).shiftStarts, SITE_TIME_ZONE)
  for (const site of [ctx.sites.mb, ctx.sites.fx]) {
    const templates = Object.fromEntries(INSPECTION_POWERS.map((power) => {
      const id = newId()
      rows.truckInspectionTemplates.push({ id, siteId: site.id, power, title: DEFAULT_INSPECTION_TITLES[power], items: [...DEFAULT_INSPECTION_ITEMS[power]], version: 1, active: true, createdAt: ctx.registeredAt, updatedAt: ctx.registeredAt })
      return [power, id]
    }))
    const mine = trucks.filter(t => t.siteId === site.id && !t.outOfService)
    mine.forEach((t, n) => {
      if (n % 4 === 3) return // not checked yet this shift
      const power = inspectionPowerOf(t.power)
      const fail: Record<string, string> = n === 0 ? { service_brake: 'Pedal sinks slowly when held' } : n === 1 ? { lights: 'Left work light out' } : {}
      const answers = DEFAULT_INSPECTION_ITEMS[power].map(i => (i.key in fail ? { key: i.key, result: 'fail' as const, note: fail[i.key]! } : { key: i.key, result: 'pass' as const, note: '' }))
      const critical = criticalFailures(DEFAULT_INSPECTION_ITEMS[power], answers)
      const at = n === 0 ? clock.at(clock.dateDaysAgo(1), 6, 12) : new Date(shiftStart.getTime() + (5 + n) * MINUTE_MS)
      if (at > clock.now) return
      const id = newId()
      rows.truckInspections.push({
        id, siteId: site.id, userId: site.people.operator, at, recordedAt: at, idempotencyKey: newId(), truckId: t.id!, templateId: templates[power]!,
        hourMeter: null, answers, criticalFailed: critical.map(i => i.label), failedCount: Object.keys(fail).length,
      })
      if (Object.keys(fail).length) {
        // as a failed check opens it: the English title, and its codes for the reader's words
        const items = Object.keys(fail).map(k => DEFAULT_INSPECTION_ITEMS[power].find(i => i.key === k)!.label).join('; ')
        const date = clock.dateOf(at)
        rows.followUps.push({ siteId: site.id, source: 'truck_inspection', sourceId: id, title: `Truck ${t.fleetNumber}: ${items} — failed pre-shift check on ${date}`, openedOn: date, titleWords: { code: 'preshift', params: { truck: t.fleetNumber!, items, date } } })
      }
    })
  }
}
