import { addCalendarInterval } from '../../shared/utils/due-dates'
import { DEFAULT_CHECKLIST_ITEMS } from '../../shared/utils/area-checklists'
import { addMinutes } from './clock'
import type { SeedContext, SiteContext } from './context'
import type { AreaRow } from './rows'
import { HISTORY_DAYS } from './battery-history'

// The demo logs use the app's own default checklist items.
export const CHARGING_AREA_ITEMS = DEFAULT_CHECKLIST_ITEMS.charging_area
export const FUEL_STATION_ITEMS = DEFAULT_CHECKLIST_ITEMS.fuel_station

const LOG_DAYS = HISTORY_DAYS

// Daily area logs for the year of the demo, recorded by the technician (now and then a day before the last
// month went unlogged, as on any site); the safety lead has signed every log before this week except the one
// with the failed eyewash at Millbrook's North charge room.
export function writeAreaLogs(ctx: SeedContext) {
  const { clock, rand, rows, newId } = ctx
  const weekStart = clock.weekStart()
  const failedOn = clock.dateDaysAgo(2)
  const oldFailOn = clock.dateDaysAgo(16)
  let failed: { entryId: string, area: string, item: string } | null = null

  for (const site of [ctx.sites.mb, ctx.sites.fx]) {
    const templates = {
      charging_area: { id: newId(), items: CHARGING_AREA_ITEMS, title: 'Charging area — daily check' },
      fuel_station: { id: newId(), items: FUEL_STATION_ITEMS, title: 'Fuel station — daily check' },
    }
    for (const [areaKind, t] of Object.entries(templates) as Array<[AreaRow['kind'], typeof templates.charging_area]>) {
      rows.checklistTemplates.push({ id: t.id, siteId: site.id, areaKind, cadence: 'daily', title: t.title, items: t.items, version: 1, active: true, createdAt: ctx.registeredAt, updatedAt: ctx.registeredAt })
    }
    for (const area of [...site.chargingAreas, site.fuelStation]) {
      const template = templates[area.kind]
      for (let d = LOG_DAYS - 1; d >= 0; d--) {
        const periodStart = clock.dateDaysAgo(d)
        const startAt = clock.at(periodStart, 6, rand.int(5, 40))
        if (startAt > clock.now) continue
        if (d > 30 && rand.chance(0.02)) continue
        const logId = newId()
        const failEyewash = site.key === 'mb' && area.name === 'North charge room' && periodStart === failedOn
        const failExtinguisher = site.key === 'fx' && area.kind === 'fuel_station' && periodStart === oldFailOn
        const signedAt = clock.at(addCalendarInterval(periodStart, 1, 'day'), 9, rand.int(0, 59))
        const signed = periodStart < weekStart && !failEyewash && signedAt < clock.now
        rows.areaLogs.push({ id: logId, siteId: site.id, areaId: area.id, templateId: template.id, cadence: 'daily', periodStart, signedBy: signed ? site.people.safety : null, signedAt: signed ? signedAt : null, createdAt: startAt, updatedAt: signed ? signedAt : startAt })
        let at = startAt
        for (const item of template.items) {
          at = addMinutes(at, rand.int(1, 3))
          const id = newId()
          let result: 'pass' | 'fail' = 'pass'
          let note = ''
          if (failEyewash && item.key === 'eyewash_flushed_reachable') {
            result = 'fail'
            note = 'Weak flow from the left nozzle when flushed. Portable eyewash placed beside the station; plumber called.'
            failed = { entryId: id, area: area.name, item: item.label }
          }
          if (failExtinguisher && item.key === 'extinguisher_present_charged') {
            result = 'fail'
            note = 'Gauge needle in the red. Swapped for the spare from the dock office.'
            writeFollowUp(ctx, site, { entryId: id, area: area.name, item: item.label }, periodStart, addMinutes(at, 240), 'Recharged unit back on its bracket; spare returned to the dock office.')
          }
          rows.areaLogEntries.push({ id, siteId: site.id, userId: site.people.technician, at, recordedAt: new Date(at.getTime() + rand.int(2, 20) * 1000), logId, itemKey: item.key, result, note })
        }
      }
    }
  }
  if (failed) writeFollowUp(ctx, ctx.sites.mb, failed, failedOn, null, null)
}

// as a failed checklist item opens one: the English title, and its codes for the reader's words
function writeFollowUp(ctx: SeedContext, site: SiteContext, failed: { entryId: string, area: string, item: string }, failedOn: string, closedAt: Date | null, closingNote: string | null) {
  const openedAt = ctx.clock.at(failedOn, 7, 30)
  ctx.rows.followUps.push({
    id: ctx.newId(),
    siteId: site.id,
    source: 'checklist',
    sourceId: failed.entryId,
    title: `${failed.area}: ${failed.item} — failed on ${failedOn}`,
    titleWords: { code: 'checklist', params: { area: failed.area, item: failed.item, date: failedOn } },
    ownerUserId: site.people.safety,
    openedOn: failedOn,
    closedAt,
    closedBy: closedAt ? site.people.safety : null,
    closingNote,
    createdAt: openedAt,
    updatedAt: closedAt ?? openedAt,
  })
}
