import { describe, it, expect } from 'vitest'
import {
  batteryReadinessReasons,
  batteryTruckFit,
  chargerBatteryMatch,
  chooseNextBattery,
  isIssuableBattery,
  rankBatteriesForTruck,
} from '../../shared/utils/battery-fit'
import type {
  BatteryCandidate,
  BatteryReadinessFacts,
  BatterySpec,
  ChargerSpec,
  FitReason,
  TruckBatterySpec,
} from '../../shared/utils/battery-fit'

function truck(overrides: Partial<TruckBatterySpec> = {}): TruckBatterySpec {
  return {
    systemVoltage: 48,
    connector: '350A red',
    allowedChemistries: ['flooded_lead_acid', 'agm'],
    compartmentLengthIn: 38.5,
    compartmentWidthIn: 20.5,
    compartmentHeightIn: 31,
    minBatteryWeightLb: 2000,
    maxBatteryWeightLb: 2400,
    ...overrides,
  }
}

function battery(overrides: Partial<BatterySpec> = {}): BatterySpec {
  return {
    voltage: 48,
    cellCount: 24,
    chemistry: 'flooded_lead_acid',
    connector: '350A red',
    lengthIn: 38.5,
    widthIn: 20,
    heightIn: 30.5,
    weightLb: 2150,
    capacityAh: 875,
    ...overrides,
  }
}

function charger(overrides: Partial<ChargerSpec> = {}): ChargerSpec {
  return {
    outputVoltage: 48,
    chemistryProfiles: ['flooded_lead_acid'],
    minCapacityAh: 750,
    maxCapacityAh: 1000,
    maxCurrentA: 175,
    ...overrides,
  }
}

const codes = (reasons: FitReason[]) => reasons.map(r => r.code)

describe('batteryTruckFit', () => {
  it('a matching battery fits, including a dimension exactly equal to the compartment', () => {
    expect(batteryTruckFit(truck(), battery())).toEqual([])
  })

  it('voltage mismatch', () => {
    const reasons = batteryTruckFit(truck(), battery({ voltage: 36, cellCount: 18 }))
    expect(reasons).toMatchObject([{ code: 'voltage_mismatch', message: 'Battery is 36 V; this truck takes 48 V.' }])
    // the numbers travel raw beside the English words, for the reader's own language
    expect(reasons[0]!.params).toEqual({ battery: 36, truck: 48 })
  })

  it('connector mismatch, ignoring case and spacing', () => {
    expect(batteryTruckFit(truck(), battery({ connector: '  350a  RED ' }))).toEqual([])
    const reasons = batteryTruckFit(truck(), battery({ connector: '350A gray' }))
    expect(reasons).toMatchObject([{ code: 'connector_mismatch', message: 'Battery connector is 350A gray; this truck takes 350A red.' }])
  })

  it('chemistry not approved for the truck', () => {
    const reasons = batteryTruckFit(truck(), battery({ chemistry: 'lithium_ion' }))
    expect(reasons).toMatchObject([{
      code: 'chemistry_not_allowed',
      message: 'This truck is not approved for lithium-ion batteries (approved: flooded lead-acid, AGM).',
    }])
  })

  it('says which compartment dimension is exceeded, without rotating the battery', () => {
    expect(batteryTruckFit(truck(), battery({ lengthIn: 39 }))).toMatchObject([
      { code: 'too_long_for_compartment', message: 'Battery is 39 in long; the compartment takes 38.5 in.' },
    ])
    expect(codes(batteryTruckFit(truck(), battery({ widthIn: 20.75 })))).toEqual(['too_wide_for_compartment'])
    expect(codes(batteryTruckFit(truck(), battery({ heightIn: 31.25 })))).toEqual(['too_tall_for_compartment'])
    // Would fit turned 90°, but a battery is not rotated in its compartment.
    const swapped = truck({ compartmentLengthIn: 20.5, compartmentWidthIn: 38.5 })
    expect(codes(batteryTruckFit(swapped, battery()))).toEqual(['too_long_for_compartment'])
  })

  it('reports a missing size instead of passing it', () => {
    expect(codes(batteryTruckFit(truck(), battery({ heightIn: 0 })))).toEqual(['compartment_size_unknown'])
    expect(codes(batteryTruckFit(truck({ compartmentWidthIn: Number.NaN }), battery()))).toEqual(['compartment_size_unknown'])
  })

  // Nameplate gives the minimum (and maximum) battery weight [mem, ANSI/ITSDF B56.1; the clause number is unchecked]
  it('under the nameplate minimum weight [mem, ANSI/ITSDF B56.1; the clause number is unchecked]', () => {
    expect(batteryTruckFit(truck(), battery({ weightLb: 1850 }))).toMatchObject([{
      code: 'under_minimum_weight',
      message: 'Battery weighs 1,850 lb; this truck\'s nameplate minimum is 2,000 lb — a light battery upsets the counterweight.',
    }])
    expect(batteryTruckFit(truck(), battery({ weightLb: 2000 }))).toEqual([])
    expect(codes(batteryTruckFit(truck(), battery({ weightLb: 1999.5 })))).toEqual(['under_minimum_weight'])
  })

  it('under-weight is reported alongside every other reason, never dropped', () => {
    const reasons = batteryTruckFit(truck(), battery({ voltage: 36, connector: '175A gray', chemistry: 'gel', lengthIn: 40, weightLb: 1200 }))
    expect(codes(reasons)).toEqual([
      'voltage_mismatch',
      'connector_mismatch',
      'chemistry_not_allowed',
      'too_long_for_compartment',
      'under_minimum_weight',
    ])
  })

  it('a missing weight on either side is reported, never passed', () => {
    expect(codes(batteryTruckFit(truck(), battery({ weightLb: 0 })))).toEqual(['battery_weight_unknown'])
    expect(codes(batteryTruckFit(truck(), battery({ weightLb: Number.NaN })))).toEqual(['battery_weight_unknown'])
    expect(codes(batteryTruckFit(truck({ minBatteryWeightLb: 0 }), battery()))).toEqual(['truck_minimum_weight_unknown'])
  })

  it('over the nameplate maximum weight [mem, ANSI/ITSDF B56.1; the clause number is unchecked]', () => {
    expect(batteryTruckFit(truck(), battery({ weightLb: 2525 }))).toMatchObject([{
      code: 'over_maximum_weight',
      message: 'Battery weighs 2,525 lb; this truck\'s nameplate maximum is 2,400 lb — a heavy battery overloads the truck.',
    }])
    expect(batteryTruckFit(truck(), battery({ weightLb: 2400 }))).toEqual([])
  })
})

describe('chargerBatteryMatch', () => {
  it('a matching charger and battery', () => {
    expect(chargerBatteryMatch(charger(), battery())).toEqual([])
    expect(chargerBatteryMatch(charger(), battery({ capacityAh: 750 }))).toEqual([])
    expect(chargerBatteryMatch(charger(), battery({ capacityAh: 1000 }))).toEqual([])
  })

  it('output voltage mismatch', () => {
    expect(chargerBatteryMatch(charger({ outputVoltage: 36 }), battery())).toMatchObject([
      { code: 'charger_voltage_mismatch', message: 'Charger puts out 36 V; this battery is 48 V.' },
    ])
  })

  it('no profile for the battery chemistry', () => {
    expect(chargerBatteryMatch(charger(), battery({ chemistry: 'agm' }))).toMatchObject([
      { code: 'charger_profile_missing', message: 'Charger has no AGM profile (it has: flooded lead-acid).' },
    ])
  })

  it('capacity below or above the charger range', () => {
    expect(chargerBatteryMatch(charger(), battery({ capacityAh: 600 }))).toMatchObject([{
      code: 'capacity_below_charger_range',
      message: 'Battery is 600 Ah; this charger is rated for 750–1,000 Ah and would charge it too hard.',
    }])
    expect(chargerBatteryMatch(charger(), battery({ capacityAh: 1200 }))).toMatchObject([{
      code: 'capacity_above_charger_range',
      message: 'Battery is 1,200 Ah; this charger is rated for 750–1,000 Ah and cannot charge it fully in time.',
    }])
    expect(codes(chargerBatteryMatch(charger(), battery({ capacityAh: 0 })))).toEqual(['capacity_unknown'])
  })
})

describe('batteryReadinessReasons', () => {
  const facts = (overrides: Partial<BatteryReadinessFacts> = {}): BatteryReadinessFacts => ({
    state: 'ready',
    outOfService: false,
    wateringOverdue: false,
    coolingMinutesLeft: 0,
    ...overrides,
  })

  it('a ready battery has no reasons', () => {
    expect(batteryReadinessReasons(facts())).toEqual([])
  })

  it('not charged: on charge or needing a charge', () => {
    expect(codes(batteryReadinessReasons(facts({ state: 'on_charge' })))).toEqual(['not_charged'])
    expect(codes(batteryReadinessReasons(facts({ state: 'needs_charge' })))).toEqual(['not_charged'])
  })

  it('still cooling, with the time left', () => {
    expect(batteryReadinessReasons(facts({ state: 'cooling', coolingMinutesLeft: 95 }))).toMatchObject([
      { code: 'still_cooling', message: 'Battery is still cooling after its charge: 1 h 35 min left.' },
    ])
    expect(batteryReadinessReasons(facts({ state: 'cooling', coolingMinutesLeft: 40 }))[0]!.message).toContain('40 min left')
    expect(batteryReadinessReasons(facts({ state: 'cooling', coolingMinutesLeft: 120 }))[0]!.message).toContain('2 h left')
  })

  it('out of service, by flag or by state, reported once', () => {
    expect(codes(batteryReadinessReasons(facts({ outOfService: true })))).toEqual(['out_of_service'])
    expect(codes(batteryReadinessReasons(facts({ state: 'out_of_service', outOfService: true })))).toEqual(['out_of_service'])
  })

  it('watering overdue', () => {
    expect(codes(batteryReadinessReasons(facts({ wateringOverdue: true })))).toEqual(['watering_overdue'])
  })

  it('already in a truck', () => {
    expect(codes(batteryReadinessReasons(facts({ state: 'in_truck' })))).toEqual(['already_in_truck'])
  })

  it('lists every reason that applies', () => {
    expect(codes(batteryReadinessReasons(facts({ state: 'cooling', coolingMinutesLeft: 10, wateringOverdue: true }))))
      .toEqual(['still_cooling', 'watering_overdue'])
  })
})

describe('chooseNextBattery and rankBatteriesForTruck', () => {
  const at = (iso: string) => new Date(iso)
  const candidate = (overrides: Partial<BatteryCandidate> & { id: string }): BatteryCandidate => ({
    ready: true,
    fitReasons: [],
    restedSince: at('2025-03-03T06:00:00Z'),
    cycleCount: 400,
    ...overrides,
  })
  const misfit: FitReason = { code: 'voltage_mismatch', message: 'Battery is 36 V; this truck takes 48 V.' }

  it('takes the battery rested longest', () => {
    const list = [
      candidate({ id: 'B-0003', restedSince: at('2025-03-03T08:00:00Z') }),
      candidate({ id: 'B-0001', restedSince: at('2025-03-03T02:00:00Z') }),
      candidate({ id: 'B-0002', restedSince: at('2025-03-03T05:00:00Z') }),
    ]
    expect(chooseNextBattery(list)).toBe('B-0001')
    expect(rankBatteriesForTruck(list).map(c => c.id)).toEqual(['B-0001', 'B-0002', 'B-0003'])
  })

  it('skips batteries that are not ready or not compatible, however long they rested', () => {
    const list = [
      candidate({ id: 'B-0001', ready: false, restedSince: at('2025-03-01T00:00:00Z') }),
      candidate({ id: 'B-0002', fitReasons: [misfit], restedSince: at('2025-03-02T00:00:00Z') }),
      candidate({ id: 'B-0003' }),
    ]
    expect(chooseNextBattery(list)).toBe('B-0003')
    expect(rankBatteriesForTruck(list).map(c => c.id)).toEqual(['B-0003', 'B-0001', 'B-0002'])
    expect(list.map(isIssuableBattery)).toEqual([false, false, true])
  })

  it('equal rest: fewest cycles, then id for a stable order', () => {
    const list = [
      candidate({ id: 'B-0009', cycleCount: 900 }),
      candidate({ id: 'B-0007', cycleCount: 300 }),
      candidate({ id: 'B-0005', cycleCount: 300 }),
    ]
    expect(rankBatteriesForTruck(list).map(c => c.id)).toEqual(['B-0005', 'B-0007', 'B-0009'])
    expect(chooseNextBattery(list)).toBe('B-0005')
  })

  it('an unknown rest start goes after every known one', () => {
    const list = [
      candidate({ id: 'B-0001', restedSince: null, cycleCount: 10 }),
      candidate({ id: 'B-0002', restedSince: at('2025-03-03T09:00:00Z'), cycleCount: 800 }),
    ]
    expect(chooseNextBattery(list)).toBe('B-0002')
  })

  it('null when nothing is ready and compatible; does not reorder its input', () => {
    expect(chooseNextBattery([])).toBeNull()
    const list = [candidate({ id: 'B-0002', ready: false }), candidate({ id: 'B-0001', fitReasons: [misfit] })]
    expect(chooseNextBattery(list)).toBeNull()
    rankBatteriesForTruck(list)
    expect(list.map(c => c.id)).toEqual(['B-0002', 'B-0001'])
  })
})
