import { describe, it, expect } from 'vitest'
import {
  BATTERY_STATES,
  BATTERY_STATE_LABELS,
  DEFAULT_BATTERY_CARE_POLICY,
  DEFAULT_COOL_DOWN_MINUTES,
  batteryFlags,
  deriveBatteryState,
} from '../../shared/utils/battery-state'
import type { BatteryCareFacts, BatteryStateFacts } from '../../shared/utils/battery-state'

const at = (iso: string) => new Date(iso)
const policy = { coolDownMinutes: DEFAULT_COOL_DOWN_MINUTES }

// Removed from a truck at 06:00, charged 06:30–14:00, complete.
function facts(overrides: Partial<BatteryStateFacts> = {}): BatteryStateFacts {
  return {
    outOfService: false,
    installedInTruck: false,
    chargeOpenSince: null,
    lastChargeEndedAt: at('2025-03-03T14:00:00Z'),
    lastChargeComplete: true,
    lastRemovedFromTruckAt: at('2025-03-03T06:00:00Z'),
    ...overrides,
  }
}

function care(overrides: Partial<BatteryCareFacts> = {}): BatteryCareFacts {
  return {
    chargesSinceWatering: 0,
    daysSinceWatering: 0,
    chargesSinceEqualize: 0,
    daysSinceEqualize: 0,
    lastSpread: null,
    lowCellCount: null,
    lastEndTempF: null,
    ...overrides,
  }
}

describe('battery state labels', () => {
  it('uses the product\'s own names', () => {
    expect(BATTERY_STATES.map(s => BATTERY_STATE_LABELS[s])).toEqual([
      'In truck', 'On charge', 'Cooling', 'Ready', 'Needs charge', 'Out of service',
    ])
  })
})

describe('deriveBatteryState', () => {
  it('default cool-down is 8 h: 8 h work / 8 h charge / 8 h cool [practice]', () => {
    expect(DEFAULT_COOL_DOWN_MINUTES).toBe(480)
  })

  it('out of service wins over everything', () => {
    const result = deriveBatteryState(facts({ outOfService: true, installedInTruck: true, chargeOpenSince: at('2025-03-03T15:00:00Z') }), policy, at('2025-03-04T12:00:00Z'))
    expect(result).toEqual({ state: 'out_of_service', coolingMinutesLeft: 0, readyAt: null })
  })

  it('in truck comes before on charge', () => {
    expect(deriveBatteryState(facts({ installedInTruck: true, chargeOpenSince: at('2025-03-03T15:00:00Z') }), policy, at('2025-03-03T16:00:00Z')).state).toBe('in_truck')
  })

  it('an open charge is on charge', () => {
    expect(deriveBatteryState(facts({ chargeOpenSince: at('2025-03-03T15:00:00Z') }), policy, at('2025-03-03T16:00:00Z')).state).toBe('on_charge')
  })

  it('cooling after a complete charge, with minutes left rounded up', () => {
    const result = deriveBatteryState(facts(), policy, at('2025-03-03T20:24:30Z'))
    expect(result.state).toBe('cooling')
    expect(result.coolingMinutesLeft).toBe(96)
    expect(result.readyAt).toEqual(at('2025-03-03T22:00:00Z'))
  })

  it('ready exactly at the end of the cool-down, cooling one millisecond before', () => {
    const before = deriveBatteryState(facts(), policy, at('2025-03-03T21:59:59.999Z'))
    expect(before).toEqual({ state: 'cooling', coolingMinutesLeft: 1, readyAt: at('2025-03-03T22:00:00Z') })
    const onTime = deriveBatteryState(facts(), policy, at('2025-03-03T22:00:00Z'))
    expect(onTime).toEqual({ state: 'ready', coolingMinutesLeft: 0, readyAt: at('2025-03-03T22:00:00Z') })
  })

  it('the cool-down is a site setting', () => {
    const short = { coolDownMinutes: 60 }
    expect(deriveBatteryState(facts(), short, at('2025-03-03T14:59:00Z')).state).toBe('cooling')
    expect(deriveBatteryState(facts(), short, at('2025-03-03T15:00:00Z')).state).toBe('ready')
    expect(deriveBatteryState(facts(), { coolDownMinutes: 0 }, at('2025-03-03T14:00:00Z')).state).toBe('ready')
    expect(() => deriveBatteryState(facts(), { coolDownMinutes: -5 }, at('2025-03-03T14:00:00Z'))).toThrow(RangeError)
  })

  it('an interrupted charge needs a charge', () => {
    expect(deriveBatteryState(facts({ lastChargeComplete: false }), policy, at('2025-03-04T06:00:00Z')))
      .toEqual({ state: 'needs_charge', coolingMinutesLeft: 0, readyAt: null })
  })

  it('a charge that ended before the battery last left a truck needs a charge', () => {
    const removedAfter = facts({ lastRemovedFromTruckAt: at('2025-03-04T06:00:00Z') })
    expect(deriveBatteryState(removedAfter, policy, at('2025-03-04T07:00:00Z')).state).toBe('needs_charge')
  })

  it('never charged needs a charge; charged but never in a truck cools then is ready', () => {
    expect(deriveBatteryState(facts({ lastChargeEndedAt: null }), policy, at('2025-03-04T07:00:00Z')).state).toBe('needs_charge')
    expect(deriveBatteryState(facts({ lastRemovedFromTruckAt: null }), policy, at('2025-03-04T07:00:00Z')).state).toBe('ready')
  })
})

describe('batteryFlags', () => {
  it('defaults: equalize every 5th cycle or weekly [practice]; 115 °F end of charge [mem]; 0.020 spread [practice]', () => {
    expect(DEFAULT_BATTERY_CARE_POLICY.equalizeEveryCharges).toBe(5)
    expect(DEFAULT_BATTERY_CARE_POLICY.equalizeEveryDays).toBe(7)
    expect(DEFAULT_BATTERY_CARE_POLICY.maxChargeTempF).toBe(115)
    expect(DEFAULT_BATTERY_CARE_POLICY.maxCellSpread).toBe(0.020)
  })

  it('a freshly watered, equalized, healthy battery raises no flag', () => {
    expect(batteryFlags(care({ lastSpread: 0.012, lowCellCount: 0, lastEndTempF: 104 }))).toEqual({
      wateringDue: false,
      wateringOverdue: false,
      equalizeDue: false,
      weakCell: false,
      ranHot: false,
    })
  })

  it('watering due at the interval in charges or days, overdue one past it', () => {
    expect(batteryFlags(care({ chargesSinceWatering: 4 }))).toMatchObject({ wateringDue: false, wateringOverdue: false })
    expect(batteryFlags(care({ chargesSinceWatering: 5 }))).toMatchObject({ wateringDue: true, wateringOverdue: false })
    expect(batteryFlags(care({ chargesSinceWatering: 6 }))).toMatchObject({ wateringDue: true, wateringOverdue: true })
    expect(batteryFlags(care({ daysSinceWatering: 7 }))).toMatchObject({ wateringDue: true, wateringOverdue: false })
    expect(batteryFlags(care({ daysSinceWatering: 8 }))).toMatchObject({ wateringDue: true, wateringOverdue: true })
  })

  it('equalize due every 5th cycle or weekly, whichever first [practice]', () => {
    expect(batteryFlags(care({ chargesSinceEqualize: 4, daysSinceEqualize: 6.9 })).equalizeDue).toBe(false)
    expect(batteryFlags(care({ chargesSinceEqualize: 5 })).equalizeDue).toBe(true)
    expect(batteryFlags(care({ daysSinceEqualize: 7 })).equalizeDue).toBe(true)
  })

  it('weak cell from a spread over 0.020 [practice] or any low cell', () => {
    expect(batteryFlags(care({ lastSpread: 0.020 })).weakCell).toBe(false)
    expect(batteryFlags(care({ lastSpread: 0.021 })).weakCell).toBe(true)
    expect(batteryFlags(care({ lastSpread: 0.015, lowCellCount: 1 })).weakCell).toBe(true)
  })

  it('ran hot above 115 °F [mem: keep under about 110–115 °F during charge]', () => {
    expect(batteryFlags(care({ lastEndTempF: 115 })).ranHot).toBe(false)
    expect(batteryFlags(care({ lastEndTempF: 116 })).ranHot).toBe(true)
    expect(batteryFlags(care({ lastEndTempF: 112 }), { ...DEFAULT_BATTERY_CARE_POLICY, maxChargeTempF: 110 }).ranHot).toBe(true)
  })

  it('takes its intervals from the site policy', () => {
    const site = { ...DEFAULT_BATTERY_CARE_POLICY, wateringEveryCharges: 10, wateringGraceCharges: 3 }
    expect(batteryFlags(care({ chargesSinceWatering: 12 }), site)).toMatchObject({ wateringDue: true, wateringOverdue: false })
    expect(batteryFlags(care({ chargesSinceWatering: 13 }), site)).toMatchObject({ wateringDue: true, wateringOverdue: true })
  })
})
