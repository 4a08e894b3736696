import type { EmissionsPolicy } from './emissions'
import { DEFAULT_EMISSIONS_POLICY } from './emissions'
import type { RequalificationMethod } from './requalification'
import { firstRequalificationDue, nextRequalificationDue } from './requalification'
import type { SiteSettings } from './site-settings'

// Fuel-station policy read from a site's settings, and the Cylinder cage's storage arithmetic.

/** The site's requalification table (years by method, 49 CFR 180.209 defaults in site settings). */
export function requalificationYearsFromSettings(settings: SiteSettings): Record<RequalificationMethod, number> {
  return {
    water_jacket: settings.requalYearsWaterJacket,
    proof_pressure: settings.requalYearsProofPressure,
    external_visual: settings.requalYearsExternalVisual,
  }
}

/** The site's emissions policy: its CO caps over the product defaults (the intervals are the emissions schedule's). */
export function emissionsPolicyFromSettings(settings: SiteSettings): EmissionsPolicy {
  return {
    ...DEFAULT_EMISSIONS_POLICY,
    maxCoPercentLp: settings.emissionsMaxCoPctLp,
    maxCoPercentGasoline: settings.emissionsMaxCoPctGasoline,
  }
}

export interface CylinderRequalificationStamp {
  manufactureYear: number
  manufactureMonth: number
  lastRequalifiedOn: string | null
  lastRequalificationMethod: RequalificationMethod | null
}

// Until its first requalification a cylinder is due 12 years after manufacture; after that the
// method of the last requalification sets the period (site table).
export function cylinderRequalificationDue(
  cylinder: CylinderRequalificationStamp,
  years: Readonly<Record<RequalificationMethod, number>>,
): string {
  if (cylinder.lastRequalifiedOn && cylinder.lastRequalificationMethod) {
    return nextRequalificationDue(cylinder.lastRequalifiedOn, cylinder.lastRequalificationMethod, years)
  }
  return firstRequalificationDue(cylinder.manufactureYear, cylinder.manufactureMonth)
}

/** Share of a fuel station's LP storage limit at which the cage warns (product default). */
export const LP_STORAGE_WARN_FRACTION = 0.8

export type LpStorageLevel = 'no_limit' | 'ok' | 'approaching' | 'over'

export interface LpStorageStanding {
  storedLb: number
  limitLb: number | null
  /** stored ÷ limit × 100; null without a limit */
  percentOfLimit: number | null
  level: LpStorageLevel
}

// At or above 80 % of the limit warns; above the limit is over (equal to the limit is still allowed).
export function lpStorageStanding(storedLb: number, limitLb: number | null | undefined): LpStorageStanding {
  if (!Number.isFinite(storedLb) || storedLb < 0) throw new RangeError(`stored propane must be 0 lb or more, got ${storedLb}`)
  if (limitLb === null || limitLb === undefined) return { storedLb, limitLb: null, percentOfLimit: null, level: 'no_limit' }
  if (!(limitLb > 0)) throw new RangeError(`storage limit must be above 0 lb, got ${limitLb}`)
  const percentOfLimit = storedLb / limitLb * 100
  const level: LpStorageLevel = storedLb > limitLb ? 'over' : storedLb >= limitLb * LP_STORAGE_WARN_FRACTION ? 'approaching' : 'ok'
  return { storedLb, limitLb, percentOfLimit, level }
}

export interface StoredCylinder {
  status: 'full' | 'empty' | 'in_use' | 'quarantined' | 'condemned'
  nominalPropaneLb: number
  /** Propane in the cylinder from its last accepted refill, when known. */
  contentsLb?: number | null
}

// Propane held in the cage: full cylinders at their nominal propane; empty, quarantined and condemned
// ones at what their last refill left (treated as 0 when unknown); cylinders on trucks are not in the cage.
export function cagePropaneLb(cylinders: readonly StoredCylinder[]): number {
  return cylinders.reduce((sum, c) => {
    if (c.status === 'in_use') return sum
    if (c.status === 'full') return sum + c.nominalPropaneLb
    return sum + Math.max(0, c.contentsLb ?? 0)
  }, 0)
}
