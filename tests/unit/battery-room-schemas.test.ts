import { describe, it, expect } from 'vitest'
import {
  WATERING_AFTER_CHARGE_HOURS, electrolyteCheckSchema, justFinishedCharge, summarizeElectrolyteReadings, swapBodySchema,
  wateringBeforeChargeCaution,
} from '../../shared/utils/battery-room-schemas'
import { DEFAULT_SG_POLICY } from '../../shared/utils/specific-gravity'

const cell = (cellNumber: number, specificGravity: number, temperatureF = 80) => ({ cellNumber, specificGravity, temperatureF })
const at = (iso: string) => new Date(iso)

describe('summarizeElectrolyteReadings', () => {
  it('corrects each cell: 1.250 at 20 °F → 1.226 and 1.235 at 100 °F → 1.243 [pub, in several battery and engine manuals]', () => {
    const s = summarizeElectrolyteReadings([cell(2, 1.235, 100), cell(1, 1.250, 20)], DEFAULT_SG_POLICY, 0.02)
    expect(s.cells.map(c => c.cellNumber)).toEqual([1, 2])
    expect(s.cells[0]!.correctedSg).toBeCloseTo(1.226, 6)
    expect(s.cells[1]!.correctedSg).toBeCloseTo(1.243, 6)
    expect(s.spread).toBeCloseTo(0.017, 6)
    expect(s.lowCells).toEqual([])
  })

  it('a pilot cell at 1.220 corrected is 50 % charged, with no spread [pub, US Army TM 5-1185]', () => {
    const s = summarizeElectrolyteReadings([cell(7, 1.220)], DEFAULT_SG_POLICY, 0.02)
    expect(s.stateOfChargePct).toBeCloseTo(50, 9)
    expect(s.spread).toBeNull()
    expect(s.lowCells).toEqual([])
  })

  it('flags a cell more than the threshold below the mean (0.020, common practice)', () => {
    const readings = [1.280, 1.280, 1.280, 1.280, 1.255, 1.280].map((sg, i) => cell(i + 1, sg))
    const s = summarizeElectrolyteReadings(readings, DEFAULT_SG_POLICY, 0.02)
    expect(s.lowCells).toEqual([5])
    expect(s.cells[4]!.low).toBe(true)
    expect(s.meanCorrectedSg).toBeCloseTo(1.27583, 5)
  })

  it('returns nothing to summarize for no readings', () => {
    expect(summarizeElectrolyteReadings([], DEFAULT_SG_POLICY, 0.02)).toMatchObject({ meanCorrectedSg: null, spread: null, stateOfChargePct: null, lowCells: [] })
  })
})

describe('watering after a charge (water after charging, not before, unless plates are exposed [pub, battery care guides])', () => {
  const ended = at('2026-03-02T06:00:00Z')
  const facts = { chargeOpen: false, lastChargeEndedAt: ended, lastInstalledAt: null }

  it(`a charge that ended within ${WATERING_AFTER_CHARGE_HOURS} h counts as just finished (Bayward's window)`, () => {
    expect(justFinishedCharge(facts, at('2026-03-02T17:59:00Z'))).toBe(true)
    expect(justFinishedCharge(facts, at('2026-03-02T18:01:00Z'))).toBe(false)
  })

  it('not after the battery has been in a truck again, and not while on charge', () => {
    expect(justFinishedCharge({ ...facts, lastInstalledAt: at('2026-03-02T07:00:00Z') }, at('2026-03-02T08:00:00Z'))).toBe(false)
    expect(justFinishedCharge({ ...facts, chargeOpen: true }, at('2026-03-02T08:00:00Z'))).toBe(false)
    expect(justFinishedCharge({ ...facts, lastChargeEndedAt: null }, at('2026-03-02T08:00:00Z'))).toBe(false)
  })

  it('the caution applies only when water was added', () => {
    const later = at('2026-03-03T08:00:00Z')
    expect(wateringBeforeChargeCaution({ ...facts, waterAddedGal: 0.5 }, later)).toBe(true)
    expect(wateringBeforeChargeCaution({ ...facts, waterAddedGal: 0 }, later)).toBe(false)
    expect(wateringBeforeChargeCaution({ ...facts, waterAddedGal: 0.5 }, at('2026-03-02T07:00:00Z'))).toBe(false)
  })
})

describe('payload schemas', () => {
  const id = '7c0e8d2a-3c1b-4e55-9a8f-0d6b1c2e3f40'
  it('a swap needs a written override reason of at least 10 characters, and different batteries in and out', () => {
    const base = { truckId: id, batteryInId: '9b1d2c3e-4f50-4a61-8b72-93a4b5c6d7e8', hourMeter: 10, idempotencyKey: id }
    expect(swapBodySchema.safeParse({ ...base, overrideReason: 'too short' }).success).toBe(false)
    expect(swapBodySchema.safeParse({ ...base, overrideReason: 'Cooled under the fan.' }).success).toBe(true)
    expect(swapBodySchema.parse({ ...base, overrideReason: '' }).overrideReason).toBeUndefined()
    expect(swapBodySchema.safeParse({ ...base, batteryOutId: base.batteryInId }).success).toBe(false)
  })

  it('a pilot-cell check is one cell, and a cell is not entered twice', () => {
    const base = { batteryId: id, level: 'ok', idempotencyKey: id }
    expect(electrolyteCheckSchema.safeParse({ ...base, scope: 'pilot_cell', cells: [cell(1, 1.28), cell(2, 1.28)] }).success).toBe(false)
    expect(electrolyteCheckSchema.safeParse({ ...base, scope: 'every_cell', cells: [cell(1, 1.28), cell(1, 1.27)] }).success).toBe(false)
    expect(electrolyteCheckSchema.safeParse({ ...base, scope: 'every_cell', cells: [cell(1, 1.28), cell(2, 1.27)] }).success).toBe(true)
  })
})
