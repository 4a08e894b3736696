import type { FitReason } from './battery-fit'
import { addCalendarInterval } from './due-dates'

// Tailpipe tests of combustion lift trucks, judged against a site policy.

export type EngineFuel = 'lp_gas' | 'gasoline' | 'diesel'

export interface EmissionsPolicy {
  /** Highest CO %, LP-gas trucks, at idle and at high idle (three-quarter throttle). */
  maxCoPercentLp: number
  /** Highest CO %, gasoline trucks, at idle and at high idle. */
  maxCoPercentGasoline: number
  /** Highest CO %, diesel trucks; null = diesel trucks are not judged on CO %. */
  maxCoPercentDiesel: number | null
  /** Days allowed to repair and retest a truck that failed. */
  retestDays: number
  /** Months between passed tests. */
  intervalMonths: number
}

export const EMISSIONS_POLICY_SOURCE
  = 'Minnesota Rules 5205.0116: CO at most 1 % (propane) and 2 % (gasoline) at idle and three-quarter throttle; no CO % rule for diesel there'

// CO caps from Minnesota Rules 5205.0116 (published). Diesel has no CO % rule in that source, so it is not
// judged on CO % (null). The yearly interval is how sites commonly meet the exposure limit (no federal rule
// requires it); the 30-day retest window is this product's default site policy, not from a rule.
export const DEFAULT_EMISSIONS_POLICY: Readonly<EmissionsPolicy> = {
  maxCoPercentLp: 1,
  maxCoPercentGasoline: 2,
  maxCoPercentDiesel: null,
  retestDays: 30,
  intervalMonths: 12,
}

export const ENGINE_FUEL_LABELS: Readonly<Record<EngineFuel, string>> = {
  lp_gas: 'LP-gas',
  gasoline: 'Gasoline',
  diesel: 'Diesel',
}

export interface EmissionsReadings {
  fuel: EngineFuel
  /** CO, % by volume, at idle. */
  coIdlePercent?: number | null
  /** CO, % by volume, at high idle (three-quarter throttle). */
  coHighIdlePercent?: number | null
  hcPpm?: number | null
  co2Percent?: number | null
  o2Percent?: number | null
}

export interface EmissionsVerdict {
  pass: boolean
  /** Why the test failed, in English words; empty when it passed. */
  reasons: string[]
  /** The same reasons coded, for the reader's language (`refusal.emissions_*` in i18n/locales). */
  findings: FitReason[]
  /** Remarks that do not fail the test. */
  notes: string[]
  /** False when the policy sets no CO % limit for this fuel. */
  judgedOnCo: boolean
}

function coLimitFor(fuel: EngineFuel, policy: EmissionsPolicy): number | null {
  if (fuel === 'lp_gas') return policy.maxCoPercentLp
  if (fuel === 'gasoline') return policy.maxCoPercentGasoline
  return policy.maxCoPercentDiesel
}

// A reading equal to the cap passes ("at most"); a missing or impossible reading fails the test.
export function assessEmissionsTest(
  readings: EmissionsReadings,
  policy: EmissionsPolicy = DEFAULT_EMISSIONS_POLICY,
): EmissionsVerdict {
  const limit = coLimitFor(readings.fuel, policy)
  const fuelLabel = ENGINE_FUEL_LABELS[readings.fuel]
  const findings: FitReason[] = []
  const notes: string[] = []
  const verdict = (judgedOnCo: boolean): EmissionsVerdict => ({ pass: findings.length === 0, reasons: findings.map(f => f.message), findings, notes, judgedOnCo })

  const percentFields: Array<[string, string, number | null | undefined]> = [
    ['co_idle', 'CO at idle', readings.coIdlePercent],
    ['co_high_idle', 'CO at high idle', readings.coHighIdlePercent],
    ['co2', 'CO2', readings.co2Percent],
    ['o2', 'O2', readings.o2Percent],
  ]
  for (const [variant, name, value] of percentFields) {
    if (value !== null && value !== undefined && (!Number.isFinite(value) || value < 0 || value > 100)) {
      findings.push({ code: 'emissions_bad_percent', message: `${name} reading ${value} % is not a valid percentage.`, params: { variant, value: String(value) } })
    }
  }
  if (readings.hcPpm !== null && readings.hcPpm !== undefined && (!Number.isFinite(readings.hcPpm) || readings.hcPpm < 0)) {
    findings.push({ code: 'emissions_bad_hc', message: `HC reading ${readings.hcPpm} ppm is not valid.`, params: { value: String(readings.hcPpm) } })
  }

  if (limit === null) {
    notes.push(`${fuelLabel} trucks are not judged on CO % by this policy.`)
    return verdict(false)
  }

  const coChecks: Array<[string, string, number | null | undefined]> = [
    ['idle', 'idle', readings.coIdlePercent],
    ['high_idle', 'high idle', readings.coHighIdlePercent],
  ]
  for (const [variant, mode, value] of coChecks) {
    if (value === null || value === undefined) {
      findings.push({ code: 'emissions_co_missing', message: `CO at ${mode} was not recorded.`, params: { variant } })
    }
    else if (Number.isFinite(value) && value > limit) {
      findings.push({ code: 'emissions_co_over', message: `CO at ${mode} is ${value} %, above the ${limit} % limit for ${fuelLabel} trucks.`, params: { variant, value, limit, fuel: readings.fuel } })
    }
  }
  return verdict(true)
}

// Passed: due again one interval later (default one year). Failed: retest within the policy's window.
export function nextEmissionsDue(
  testDate: string,
  pass: boolean,
  policy: EmissionsPolicy = DEFAULT_EMISSIONS_POLICY,
): string {
  return pass
    ? addCalendarInterval(testDate, policy.intervalMonths, 'month')
    : addCalendarInterval(testDate, policy.retestDays, 'day')
}
