import { randomUUID } from 'node:crypto'
import fc from 'fast-check'
import { answers } from './inspection'
import type { Client } from './http'

// The pre-shift inspection commands of the read-models property test: an inspection of one of the
// world's trucks (sometimes failing a critical item, sometimes a minor one, sent up to 20 h late) and a
// return to service.

const ago = fc.integer({ min: 1, max: 20 * 60 })
export const INSPECTION_COMMANDS = [
  fc.record({ t: fc.constant('inspect' as const), truck: fc.nat(2), outcome: fc.constantFrom('pass', 'critical', 'minor'), hours: fc.integer({ min: 0, max: 30 }), ago }),
  fc.record({ t: fc.constant('returnToService' as const), truck: fc.nat(2) }),
] as const
export type InspectionCommand = typeof INSPECTION_COMMANDS[number] extends fc.Arbitrary<infer T> ? T : never

interface InspectionWorld { lead: Client, trucks: string[], lpTruckId: string }

export async function applyInspection(w: InspectionWorld, c: InspectionCommand, meterOf: (truckId: string) => Promise<number>): Promise<number> {
  const truckId = [...w.trucks, w.lpTruckId][c.truck]!
  const power = truckId === w.lpTruckId ? 'lp_gas' : 'electric'
  if (c.t === 'returnToService') return (await w.lead.post(`/api/trucks/${truckId}/return-to-service`, { whatWasDone: 'Put right and tested' })).status
  const fail = c.outcome === 'critical' ? { horn: 'Silent' } : c.outcome === 'minor' ? { lights: 'One lamp out' } : {}
  return (await w.lead.post(`/api/trucks/${truckId}/inspections`, {
    idempotencyKey: randomUUID(), templateVersion: 1, hourMeter: (await meterOf(truckId)) + c.hours,
    at: new Date(Date.now() - c.ago * 60_000).toISOString(), answers: answers(power, fail),
  })).status
}
