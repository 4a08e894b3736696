import { describe, it, expect } from 'vitest'
import { BATTERY_STATES, BATTERY_STATE_LABELS, DEFAULT_COOL_DOWN_MINUTES, batteryStateAt } from '../../shared/utils/battery-state'
import { batteryObligations, batteryStatusFrom, type BatteryFacts } from '../../shared/utils/derived-battery'
import { defaultSchedules } from '../../shared/utils/due-schedules'
import { obligationStateAt } from '../../shared/utils/due-rules'

const at = (iso: string) => new Date(iso)
const policy = { coolDownMinutes: DEFAULT_COOL_DOWN_MINUTES, cellSpreadThreshold: 0.02, maxChargeTempF: 115 }
const TZ = 'America/Chicago'

// Removed from a truck at 06:00, charged 06:30–14:00 (complete), registered long before.
function facts(over: Partial<BatteryFacts> = {}): BatteryFacts {
  return {
    id: 'b1', siteId: 's1', serial: 'BAT-1', tagCode: 'B-00001', homeAreaId: null, chemistry: 'flooded_lead_acid', outOfService: false,
    createdAt: at('2025-01-01T12:00:00Z'), inServiceOn: null, heldAt: null, openCharge: null,
    lastEndedCharge: { endedAt: at('2025-03-03T14:00:00Z'), outcome: 'complete', endTempF: 100 },
    cycles: 0, lastIn: { at: at('2025-03-02T06:00:00Z'), truckId: 't1' }, lastOut: at('2025-03-03T06:00:00Z'), displaced: false,
    lastWateredAt: null, lastEqualizedAt: null, chargeEnds: [], lastSg: null, lastCellCheck: null, completions: [],
    ...over,
  }
}
const stateOf = (f: BatteryFacts, now: Date, p = policy) => {
  const row = batteryStatusFrom(f, p)
  return batteryStateAt(row.state, row.readyAt, now)
}

describe('battery state labels', () => {
  it('uses the product\'s own names', () => {
    expect(BATTERY_STATES.map(s => BATTERY_STATE_LABELS[s])).toEqual([
      'In truck', 'On charge', 'Cooling', 'Ready', 'Needs charge', 'Out of service',
    ])
  })
})

describe('battery status from its records', () => {
  it('default cool-down is 8 h: 8 h work / 8 h charge / 8 h cool [practice]', () => {
    expect(DEFAULT_COOL_DOWN_MINUTES).toBe(480)
  })

  it('out of service wins over everything', () => {
    const row = batteryStatusFrom(facts({ outOfService: true, heldAt: at('2025-03-03T15:00:00Z'), openCharge: { id: 'c1', at: at('2025-03-03T15:00:00Z'), chargerId: 'ch1' } }), policy)
    expect(row).toMatchObject({ state: 'out_of_service', stateSince: at('2025-03-03T15:00:00Z'), readyAt: null })
  })

  it('in a truck when its latest installation is later than its latest removal, and no other battery went in since', () => {
    const fitted = facts({ lastIn: { at: at('2025-03-03T16:00:00Z'), truckId: 't2' } })
    expect(batteryStatusFrom(fitted, policy)).toMatchObject({ state: 'in_truck', truckId: 't2', stateSince: at('2025-03-03T16:00:00Z') })
    expect(batteryStatusFrom({ ...fitted, displaced: true }, policy)).toMatchObject({ state: 'charged', truckId: null })
  })

  it('an open charge is on charge, on that charger', () => {
    const row = batteryStatusFrom(facts({ openCharge: { id: 'c9', at: at('2025-03-03T15:00:00Z'), chargerId: 'ch1' } }), policy)
    expect(row).toMatchObject({ state: 'on_charge', chargeSessionId: 'c9', chargerId: 'ch1' })
  })

  it('charged: Cooling with minutes left rounded up until ready-at, Ready exactly then (read time)', () => {
    const row = batteryStatusFrom(facts(), policy)
    expect(row).toMatchObject({ state: 'charged', readyAt: at('2025-03-03T22:00:00Z') })
    expect(batteryStateAt(row.state, row.readyAt, at('2025-03-03T20:30:30Z'))).toEqual({ state: 'cooling', coolingMinutesLeft: 90, readyAt: at('2025-03-03T22:00:00Z') })
    expect(batteryStateAt(row.state, row.readyAt, at('2025-03-03T21:59:59.999Z')).state).toBe('cooling')
    expect(batteryStateAt(row.state, row.readyAt, at('2025-03-03T22:00:00Z')).state).toBe('ready')
  })

  it('the cool-down is a site setting', () => {
    expect(stateOf(facts(), at('2025-03-03T15:30:00Z'), { ...policy, coolDownMinutes: 60 }).state).toBe('ready')
  })

  it('an interrupted charge, or one that ended before the battery last left a truck, needs a charge', () => {
    expect(stateOf(facts({ lastEndedCharge: { endedAt: at('2025-03-03T14:00:00Z'), outcome: 'interrupted', endTempF: 100 } }), at('2025-03-04T12:00:00Z')).state).toBe('needs_charge')
    expect(stateOf(facts({ lastOut: at('2025-03-03T15:00:00Z') }), at('2025-03-04T12:00:00Z')).state).toBe('needs_charge')
    expect(stateOf(facts({ lastEndedCharge: null, lastIn: null, lastOut: null }), at('2025-03-04T12:00:00Z')).state).toBe('needs_charge')
  })

  it('counts charges since watering and equalize; a weak cell from a spread over 0.020 [practice] or any low cell; ran hot above 115 °F [mem]', () => {
    const ends = ['2025-03-01T10:00:00Z', '2025-03-02T10:00:00Z', '2025-03-03T14:00:00Z'].map(at)
    const row = batteryStatusFrom(facts({
      chargeEnds: ends, lastWateredAt: at('2025-03-01T12:00:00Z'), lastEqualizedAt: null,
      lastCellCheck: { at: at('2025-03-01T12:00:00Z'), spread: 0.025, lowCellCount: 0 },
      lastEndedCharge: { endedAt: ends[2]!, outcome: 'complete', endTempF: 116 },
    }), policy)
    expect(row).toMatchObject({ chargesSinceWatering: 2, chargesSinceEqualize: 3, weakCell: true, ranHot: true, lastSpread: 0.025 })
    expect(batteryStatusFrom(facts({ lastCellCheck: { at: ends[0]!, spread: 0.02, lowCellCount: 0 } }), policy).weakCell).toBe(false)
    expect(batteryStatusFrom(facts({ lastCellCheck: { at: ends[0]!, spread: 0.01, lowCellCount: 1 } }), policy).weakCell).toBe(true)
  })
})

describe('watering: one rule for the Bay board and the due list', () => {
  const schedules = defaultSchedules()
  // five charges since watering (every 5 charges or 7 days, common practice), the fifth ending on 3 March (Chicago)
  const ends = ['2025-03-01T02:00:00Z', '2025-03-01T20:00:00Z', '2025-03-02T10:00:00Z', '2025-03-02T22:00:00Z', '2025-03-03T16:00:00Z'].map(at)
  const watering = (f: BatteryFacts) => batteryObligations(f, schedules, TZ).find(o => o.kind === 'battery_watering')!

  it('falls due the day the fifth charge ends: Due soon that day, Overdue from the next', () => {
    const o = watering(facts({ lastWateredAt: at('2025-02-28T18:00:00Z'), chargeEnds: ends }))
    expect(o).toMatchObject({ dueOn: '2025-03-03', dueAtCount: 5, countNow: 5, lastDoneOn: '2025-02-28', detail: '5 of 5 charges since watering' })
    expect(obligationStateAt(o, '2025-03-03')).toBe('due_soon')
    expect(obligationStateAt(o, '2025-03-04')).toBe('overdue')
  })

  it('or 7 days after the last watering, whichever comes first', () => {
    const o = watering(facts({ lastWateredAt: at('2025-02-28T18:00:00Z'), chargeEnds: ends.slice(0, 2) }))
    expect(o).toMatchObject({ dueOn: '2025-03-07', countNow: 2 })
    expect(obligationStateAt(o, '2025-03-05')).toBe('upcoming')
    expect(obligationStateAt(o, '2025-03-06')).toBe('due_soon')
  })

  it('sealed batteries and batteries out of service owe no watering', () => {
    expect(batteryObligations(facts({ chemistry: 'agm' }), schedules, TZ).map(o => o.kind)).toEqual([])
    expect(batteryObligations(facts({ outOfService: true }), schedules, TZ)).toEqual([])
  })
})
