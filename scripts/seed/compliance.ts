import { addCalendarInterval } from '../../shared/utils/due-dates'
import { assessEmissionsTest, nextEmissionsDue, type EngineFuel } from '../../shared/utils/emissions'
import { emissionsPolicyFromSettings } from '../../shared/utils/fuel-policy'
import type { SeedContext, SiteKey } from './context'
import { roundTo } from './random'
import { emissionsCertificate } from './certificates'
import type { TruckRow } from './rows'

const TESTERS = ['Delphine Ruaro', 'Anselm Tiwari-Booth']

// Yearly tailpipe tests: MB-16 falls due next month, FX-09 is overdue (last tested about 13 months ago),
// MB-18 failed once and passed its retest. Each test has the tester's certificate (a PDF, seed/certificates.ts).
export async function writeEmissionsTests(ctx: SeedContext, combustion: TruckRow[]) {
  const { clock, rand, rows } = ctx
  const policy = emissionsPolicyFromSettings(ctx.settings)
  const nextMonth15 = `${addCalendarInterval(clock.today, 1, 'month').slice(0, 7)}-15`
  const monthsAgo: Record<string, number> = { 'MB-15': 3, 'MB-17': 8, 'MB-18': 6, 'MB-19': 5, 'MB-20': 9, 'FX-08': 2, 'FX-10': 7 }

  for (const truck of combustion) {
    const fuel = truck.power as EngineFuel
    const site: SiteKey = truck.siteId === ctx.sites.mb.id ? 'mb' : 'fx'
    let last: string
    if (truck.fleetNumber === 'MB-16') last = addCalendarInterval(nextMonth15, -12, 'month')
    else if (truck.fleetNumber === 'FX-09') last = addCalendarInterval(addCalendarInterval(clock.today, -13, 'month'), -5, 'day')
    else last = addCalendarInterval(addCalendarInterval(clock.today, -(monthsAgo[truck.fleetNumber] ?? 4), 'month'), rand.int(-10, 10), 'day')
    const tests: Array<{ on: string, fail?: boolean }> = [{ on: addCalendarInterval(last, -12, 'month') }]
    if (truck.fleetNumber === 'MB-18') tests.push({ on: addCalendarInterval(last, -12, 'day'), fail: true })
    tests.push({ on: last })

    for (const test of tests) {
      const gasoline = fuel === 'gasoline'
      const coIdlePct = test.fail ? 1.38 : roundTo(gasoline ? rand.between(0.4, 1.1) : rand.between(0.2, 0.6), 2)
      const coHighIdlePct = test.fail ? 1.12 : roundTo(gasoline ? rand.between(0.3, 0.9) : rand.between(0.2, 0.6), 2)
      const hcPpm = Math.round(gasoline ? rand.between(120, 300) : rand.between(60, 220))
      const co2Pct = roundTo(rand.between(12.2, 13.6), 1)
      const o2Pct = roundTo(rand.between(0.3, 1.4), 1)
      const testedAt = clock.at(test.on, 9, rand.int(0, 50))
      const verdict = assessEmissionsTest({ fuel, coIdlePercent: coIdlePct, coHighIdlePercent: coHighIdlePct, hcPpm, co2Percent: co2Pct, o2Percent: o2Pct }, policy)
      const id = ctx.newId()
      const testerName = rand.pick(TESTERS)
      const idleRpm = Math.round(rand.between(750, 850) / 10) * 10
      const highIdleRpm = Math.round(rand.between(2200, 2500) / 10) * 10
      const certificateUploadId = await emissionsCertificate(ctx, id, {
        siteId: truck.siteId, siteName: ctx.sites[site].name, userId: ctx.sites[site].people.facilities, truck: truck.fleetNumber!, fuel, testedOn: test.on, at: testedAt,
        tester: testerName, readings: { coIdlePct, coHighIdlePct, hcPpm, co2Pct, o2Pct, idleRpm, highIdleRpm }, passed: verdict.pass, reasons: verdict.reasons,
      })
      rows.emissionsTests.push({
        id,
        siteId: truck.siteId,
        userId: ctx.sites[site].people.facilities,
        at: testedAt,
        recordedAt: testedAt,
        truckId: truck.id,
        testedOn: test.on,
        testerName,
        coIdlePct,
        coHighIdlePct,
        hcPpm,
        co2Pct,
        o2Pct,
        idleRpm,
        highIdleRpm,
        passed: verdict.pass,
        reasons: verdict.reasons,
        nextDueOn: nextEmissionsDue(test.on, verdict.pass, policy),
        certificateUploadId,
        note: test.fail ? 'Mixer adjusted and air filter replaced; retest booked.' : '',
      })
    }
  }
}

// Indoor CO at both sites: a few timed readings per area each month at Millbrook, each quarter at
// Fenwick (the default schedule's interval), under eight hours in all.
export function writeCoReadings(ctx: SeedContext) {
  for (const [site, everyMonths] of [[ctx.sites.mb, 1], [ctx.sites.fx, 3]] as const) writeSiteCoReadings(ctx, site, everyMonths)
}

function writeSiteCoReadings(ctx: SeedContext, site: SeedContext['sites']['mb'], everyMonths: number) {
  const { clock, rand, rows } = ctx
  const areas = [...site.chargingAreas, site.fuelStation]
  for (let m = 0; m < 12; m += everyMonths) {
    areas.forEach((area, i) => {
      const takenOn = clock.dateDaysAgo(m * 30 + 4 + i)
      const plan: Array<[number, number]> = rand.chance(0.5) ? [[8, 2.5], [10.5, 3], [13.5, 2.5]] : [[8, 2], [10, 3], [13, 2]]
      for (const [hour, durationHours] of plan) {
        const at = clock.at(takenOn, Math.floor(hour), (hour % 1) * 60)
        if (at > clock.now) continue
        rows.coReadings.push({ id: ctx.newId(), siteId: site.id, userId: site.people.safety, at, recordedAt: at, areaId: area.id, takenOn, ppm: Math.round(rand.between(10, 30)), durationHours })
      }
    })
  }
}
