import { randomUUID } from 'node:crypto'
import type postgres from 'postgres'
import { openLoop, type OpenStream } from './load'
import { batteriesInTwoPlaces, readyBatteries } from './routes'
import type { BenchServer } from './server'
import { BENCH, benchId } from './shape'

// Shift change at 50 sites, open loop at fixed rates for a minute: battery swaps, charges started and
// ended, electrolyte checks, every charging area's wall board polled every 5 s, due lists opened and tags
// looked up, all by a floor crew member (operator and technician at every site).

export const SHIFT_SECONDS = Number(process.env.BAYWARD_SHIFT_SECONDS ?? 60)
// A server that has been up through the shift before: the mix runs first at its own rates on the fresh server
// for this long (BAYWARD_SHIFT_WARMUP_SECONDS, 10 by default; 0 for none), reported on its own, and the measured
// minute starts once the warm-up's answers are in. The first seconds of a server cost more: new PostgreSQL
// connections, each planning its statements anew, and code not yet optimised.
export const SHIFT_WARMUP_SECONDS = Number(process.env.BAYWARD_SHIFT_WARMUP_SECONDS ?? 10)
export const SHIFT_RATES = { swap: 20, chargeStart: 20, chargeEnd: 20, check: 5, boardAreas: BENCH.sites * 3, boardEverySeconds: 5, due: 20, tag: 200 }

const pick = <T>(list: T[]) => list[Math.floor(Math.random() * list.length)]

export async function runShiftChange(server: BenchServer, sql: postgres.Sql) {
  const cookie = await server.signIn(BENCH.shiftEmail)
  const sites = Array.from({ length: BENCH.sites }, (_, i) => benchId(`site:${i + 1}`))
  const since = new Date()
  // The floor as it stands: trucks and their batteries, Ready batteries, batteries needing a charge, free
  // chargers and open charges, per site.
  const trucks = await sql<{ id: string, siteId: string, hourMeter: number, batteryId: string | null }[]>`
    SELECT t.id, t.site_id AS "siteId", ts.hour_meter AS "hourMeter", s.battery_id AS "batteryId"
    FROM trucks t JOIN truck_status ts ON ts.truck_id = t.id LEFT JOIN battery_status s ON s.truck_id = t.id
    WHERE t.power = 'electric' AND NOT t.out_of_service`
  const ready = await readyBatteries(server.base, cookie, sites.map((_, i) => i + 1))
  const needsCharge = new Map<string, string[]>()
  for (const r of await sql<{ id: string, siteId: string }[]>`SELECT battery_id AS id, site_id AS "siteId" FROM battery_status WHERE state = 'needs_charge'`) {
    needsCharge.set(r.siteId, [...(needsCharge.get(r.siteId) ?? []), r.id])
  }
  const freeChargers = new Map<string, string[]>()
  for (const c of await sql<{ id: string, siteId: string }[]>`
    SELECT ch.id, ch.site_id AS "siteId" FROM chargers ch WHERE NOT ch.out_of_service
      AND NOT EXISTS (SELECT 1 FROM battery_status s WHERE s.charger_id = ch.id)`) {
    freeChargers.set(c.siteId, [...(freeChargers.get(c.siteId) ?? []), c.id])
  }
  const open: { sessionId: string, siteId: string, chargerId: string, batteryId: string }[] = (await sql<{ sessionId: string, siteId: string, chargerId: string, batteryId: string }[]>`
    SELECT charge_session_id AS "sessionId", site_id AS "siteId", charger_id AS "chargerId", battery_id AS "batteryId" FROM battery_status WHERE charge_session_id IS NOT NULL`)
  const flooded = (await sql<{ id: string }[]>`SELECT b.id FROM batteries b JOIN battery_status s ON s.battery_id = b.id WHERE b.chemistry = 'flooded_lead_acid' AND s.state <> 'out_of_service'`).map(r => r.id)
  const areas = (await sql<{ id: string, siteId: string }[]>`SELECT id, site_id AS "siteId" FROM areas WHERE kind = 'charging_area' ORDER BY site_id, name`)
  const idleTrucks = trucks.filter(t => t.batteryId)
  let areaTurn = 0

  const swap: OpenStream = {
    name: 'POST /api/battery-room/swaps', rate: SHIFT_RATES.swap,
    next: () => {
      for (let tries = 0; tries < idleTrucks.length; tries++) {
        const truck = idleTrucks.shift()!
        const batteryIn = ready.get(truck.siteId)?.shift()
        if (!batteryIn) {
          idleTrucks.push(truck)
          continue
        }
        truck.hourMeter += 1
        return { method: 'POST', path: '/api/battery-room/swaps', body: { truckId: truck.id, batteryOutId: truck.batteryId, batteryInId: batteryIn, hourMeter: truck.hourMeter, idempotencyKey: randomUUID() }, meta: truck }
      }
      return null
    },
    onAnswer: (status, _body, req) => {
      const truck = req.meta as typeof trucks[number]
      const { batteryInId, batteryOutId } = req.body as { batteryInId: string, batteryOutId: string }
      if (status === 201) {
        truck.batteryId = batteryInId
        needsCharge.set(truck.siteId, [...(needsCharge.get(truck.siteId) ?? []), batteryOutId])
      }
      idleTrucks.push(truck)
    },
  }
  const chargeStart: OpenStream = {
    name: 'POST /api/battery-room/charges', rate: SHIFT_RATES.chargeStart,
    next: () => {
      for (const siteId of [...sites].sort(() => Math.random() - 0.5)) {
        const batteries = needsCharge.get(siteId)
        const chargers = freeChargers.get(siteId)
        if (!batteries?.length || !chargers?.length) continue
        return { method: 'POST', path: '/api/battery-room/charges', body: { batteryId: batteries.shift(), chargerId: chargers.shift(), idempotencyKey: randomUUID() }, meta: siteId }
      }
      return null
    },
    onAnswer: (status, body, req) => {
      const b = req.body as { batteryId: string, chargerId: string }
      const siteId = req.meta as string
      if (status === 201) open.push({ sessionId: (JSON.parse(body) as { item: { id: string } }).item.id, siteId, chargerId: b.chargerId, batteryId: b.batteryId })
      else freeChargers.get(siteId)!.push(b.chargerId)
    },
  }
  const chargeEnd: OpenStream = {
    name: 'POST /api/battery-room/charges/:id/end', rate: SHIFT_RATES.chargeEnd,
    next: () => {
      const session = open.splice(Math.floor(Math.random() * open.length), 1)[0]
      if (!session) return null
      return { method: 'POST', path: `/api/battery-room/charges/${session.sessionId}/end`, body: { ampHoursReturned: 640, endTempF: 104, equalize: false, outcome: 'complete' }, meta: session }
    },
    onAnswer: (status, _body, req) => {
      const session = req.meta as typeof open[number]
      if (status === 200) freeChargers.set(session.siteId, [...(freeChargers.get(session.siteId) ?? []), session.chargerId])
    },
  }
  const check: OpenStream = {
    name: 'POST /api/battery-room/checks', rate: SHIFT_RATES.check,
    next: () => ({ method: 'POST', path: '/api/battery-room/checks', body: { batteryId: pick(flooded), level: 'ok', waterAddedGal: 0.6, idempotencyKey: randomUUID() } }),
  }
  const board: OpenStream = {
    name: `GET /api/battery-room/board (each area every ${SHIFT_RATES.boardEverySeconds} s)`, rate: SHIFT_RATES.boardAreas / SHIFT_RATES.boardEverySeconds,
    next: () => {
      const a = areas[areaTurn++ % areas.length]!
      return { method: 'GET', path: `/api/battery-room/board?siteId=${a.siteId}&areaId=${a.id}` }
    },
  }
  // the shift's technician opens their own due list (role=all is a lead's view, and answered them 403)
  const due: OpenStream = { name: 'GET /api/due (as the due page opens)', rate: SHIFT_RATES.due, next: () => ({ method: 'GET', path: `/api/due?siteId=${pick(sites)}&sort=due&limit=0` }) }
  const tag: OpenStream = {
    name: 'GET /api/tags/<code>', rate: SHIFT_RATES.tag,
    next: () => ({ method: 'GET', path: `/api/tags/B-${String(1 + Math.floor(Math.random() * BENCH.sites * BENCH.batteriesPerSite)).padStart(5, '0')}` }),
  }
  const streams = [swap, chargeStart, chargeEnd, check, board, due, tag]
  console.log(`  shift change: ${SHIFT_SECONDS} s at ${streams.map(s => `${s.rate}/s`).join(', ')}…`)
  const warm = SHIFT_WARMUP_SECONDS > 0 ? await openLoop(server.base, cookie, streams, SHIFT_WARMUP_SECONDS, false) : undefined
  const figures = await openLoop(server.base, cookie, streams, SHIFT_SECONDS)
  for (const f of figures) console.log(`  [shift] ${f.route}: ${f.requests} answered, p95 ${f.p95.toFixed(1)} ms, ${f.errors} errors, ${f.skipped} skipped ${JSON.stringify(f.statuses)}`)
  return { warm, figures, twoPlaces: await batteriesInTwoPlaces(sql, since) }
}
