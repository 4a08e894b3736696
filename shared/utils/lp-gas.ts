// LP-gas cylinder filling by weight: fill limit from water capacity, net propane, gallons, tare loss.

export interface FillingDensityRow {
  /** Lowest specific gravity at 60 °F in the row (inclusive, 3 decimals). */
  minSg: number
  /** Highest specific gravity at 60 °F in the row (inclusive, 3 decimals). */
  maxSg: number
  /** Maximum filling density, % of the container's water capacity by weight. */
  percentByWeight: number
}

export const FILLING_DENSITY_SOURCE
  = '29 CFR 1910.110 filling-density table (table number unchecked) as reproduced in WAC 296-307-41037 Table U-4; containers up to 1,200 gal water capacity'

// Maximum filling density by weight for containers up to 1,200 US gal water capacity,
// 29 CFR 1910.110 filling-density table as reproduced in WAC 296-307-41037 Table U-4.
export const FILLING_DENSITY_TABLE: readonly FillingDensityRow[] = [
  { minSg: 0.496, maxSg: 0.503, percentByWeight: 41 },
  { minSg: 0.504, maxSg: 0.510, percentByWeight: 42 },
  { minSg: 0.511, maxSg: 0.519, percentByWeight: 43 },
  { minSg: 0.520, maxSg: 0.527, percentByWeight: 44 },
  { minSg: 0.528, maxSg: 0.536, percentByWeight: 45 },
]

// Commercial propane, inside the 0.504–0.510 row (42 %). 0.507 is the relative density of pure
// propane at 60 °F (GPA 2145, from memory); use the supplier's stated value when known.
export const PROPANE_DEFAULT_SG = 0.507

/** Propane, pounds per US gallon of liquid at 60 °F (published supplier guides). */
export const PROPANE_LB_PER_GAL_60F = 4.2

/** Tare loss at which a cylinder must be requalified before refilling (NFPA 58 annex guide). */
export const TARE_LOSS_REQUALIFICATION_PERCENT = 5

// The table lists specific gravity to three decimals, so a reading is rounded to three decimals first
// (0.5104 → 0.510, row 42 %). Outside 0.496–0.536 the table gives nothing: null, never a guess.
export function maxFillingDensityPercent(specificGravityAt60F: number): number | null {
  if (!Number.isFinite(specificGravityAt60F)) return null
  const sg = Math.round(specificGravityAt60F * 1000) / 1000
  const row = FILLING_DENSITY_TABLE.find(r => sg >= r.minSg && sg <= r.maxSg)
  return row ? row.percentByWeight : null
}

/** Most propane (lb) a container may hold: water capacity × filling density; null outside the table. */
export function fillLimitLb(waterCapacityLb: number, sg: number = PROPANE_DEFAULT_SG): number | null {
  const percent = maxFillingDensityPercent(sg)
  if (percent === null || !Number.isFinite(waterCapacityLb) || waterCapacityLb <= 0) return null
  return waterCapacityLb * percent / 100
}

/** Propane added between two scale readings of the same cylinder (negative if it got lighter). */
export function netPropaneLb(scaleBeforeLb: number, scaleAfterLb: number): number {
  return scaleAfterLb - scaleBeforeLb
}

/** Liquid propane volume at 60 °F from its weight, at 4.2 lb/gal. */
export function gallonsAt60F(lb: number): number {
  return lb / PROPANE_LB_PER_GAL_60F
}

// 29 CFR 1910.110(b)(19): maximum liquid volume (gal) = (container gal × filling density %) /
// (specific gravity × volume correction factor × 100). The correction factor comes from OSHA Table H-29
// (1.031 at 40 °F) or GPA TP-27 / API MPMS 11.2.4; this function does not estimate it.
export function maxLiquidVolumeGal(
  containerGal: number,
  densityPercent: number,
  sg: number,
  volumeCorrectionFactor: number,
): number {
  if (!(containerGal > 0) || !(densityPercent > 0) || !(sg > 0) || !(volumeCorrectionFactor > 0)) {
    throw new RangeError('container volume, filling density, specific gravity and correction factor must all be above zero')
  }
  return (containerGal * densityPercent) / (sg * volumeCorrectionFactor * 100)
}

/** Smallest water capacity (lb) that may legally hold a given weight of propane; null outside the table. */
export function requiredWaterCapacityLb(propaneLb: number, sg: number = PROPANE_DEFAULT_SG): number | null {
  const percent = maxFillingDensityPercent(sg)
  if (percent === null || !Number.isFinite(propaneLb) || propaneLb < 0) return null
  return propaneLb / (percent / 100)
}

/** Percent of the stamped tare weight the cylinder has lost (negative if it now weighs more). */
export function tareLossPercent(stampedTareLb: number, measuredTareLb: number): number {
  if (!(stampedTareLb > 0) || !Number.isFinite(measuredTareLb) || measuredTareLb < 0) {
    throw new RangeError('stamped tare must be above zero and measured tare zero or more')
  }
  return (stampedTareLb - measuredTareLb) / stampedTareLb * 100
}

/** A tare loss of 5 % or more sends the cylinder for requalification (NFPA 58 annex guide). */
export function tareLossFlagsRequalification(stampedTareLb: number, measuredTareLb: number): boolean {
  return tareLossPercent(stampedTareLb, measuredTareLb) >= TARE_LOSS_REQUALIFICATION_PERCENT
}

export interface FillWeights {
  waterCapacityLb: number
  tareLb: number
  grossBeforeLb: number
  grossAfterLb: number
  /** Specific gravity at 60 °F; defaults to PROPANE_DEFAULT_SG. */
  sg?: number
}

export type FillInputProblem = 'invalid_number' | 'water_capacity_not_positive' | 'tare_not_positive' | 'gross_below_tare' | 'after_below_before' | 'sg_outside_table'

export interface FillInputError {
  field: keyof FillWeights
  problem: FillInputProblem
  message: string
}

export interface FillAssessment {
  ok: true
  netAddedLb: number
  contentsAfterLb: number
  fillLimitLb: number
  /** Propane above the limit, 0 when within it. */
  overfillLb: number
  overfilled: boolean
  gallonsAt60F: number
  percentOfLimit: number
}

export type FillAssessmentResult = FillAssessment | { ok: false, errors: FillInputError[] }

// Checks one refill by weight; impossible weights come back as errors, never as NaN or negative propane.
export function assessFill(weights: FillWeights): FillAssessmentResult {
  const { waterCapacityLb, tareLb, grossBeforeLb, grossAfterLb } = weights
  const sg = weights.sg ?? PROPANE_DEFAULT_SG
  const errors: FillInputError[] = []
  const numbers: Array<[keyof FillWeights, number]> = [
    ['waterCapacityLb', waterCapacityLb],
    ['tareLb', tareLb],
    ['grossBeforeLb', grossBeforeLb],
    ['grossAfterLb', grossAfterLb],
    ['sg', sg],
  ]
  for (const [field, value] of numbers) {
    if (!Number.isFinite(value)) errors.push({ field, problem: 'invalid_number', message: `${field} is not a number` })
  }
  if (errors.length > 0) return { ok: false, errors }

  if (waterCapacityLb <= 0) {
    errors.push({ field: 'waterCapacityLb', problem: 'water_capacity_not_positive', message: 'Water capacity must be above zero.' })
  }
  if (tareLb <= 0) {
    errors.push({ field: 'tareLb', problem: 'tare_not_positive', message: 'Tare weight must be above zero.' })
  }
  if (grossBeforeLb < tareLb) {
    errors.push({
      field: 'grossBeforeLb',
      problem: 'gross_below_tare',
      message: 'Weight before filling is below the tare weight: check the scale and the stamped tare (a lighter cylinder may need requalification).',
    })
  }
  if (grossAfterLb < tareLb) {
    errors.push({
      field: 'grossAfterLb',
      problem: 'gross_below_tare',
      message: 'Weight after filling is below the tare weight: check the scale and the stamped tare.',
    })
  }
  if (grossAfterLb < grossBeforeLb) {
    errors.push({ field: 'grossAfterLb', problem: 'after_below_before', message: 'Weight after filling is lower than before filling.' })
  }
  const limit = fillLimitLb(waterCapacityLb, sg)
  if (maxFillingDensityPercent(sg) === null) {
    errors.push({
      field: 'sg',
      problem: 'sg_outside_table',
      message: `Specific gravity ${sg} is outside the filling-density table (0.496–0.536); no fill limit can be given.`,
    })
  }
  if (errors.length > 0 || limit === null) return { ok: false, errors }

  const contentsAfterLb = grossAfterLb - tareLb
  const overfillLb = Math.max(0, contentsAfterLb - limit)
  return {
    ok: true,
    netAddedLb: netPropaneLb(grossBeforeLb, grossAfterLb),
    contentsAfterLb,
    fillLimitLb: limit,
    overfillLb,
    overfilled: overfillLb > 0,
    gallonsAt60F: gallonsAt60F(contentsAfterLb),
    percentOfLimit: contentsAfterLb / limit * 100,
  }
}

export type PrefillInspectionKey = 'dents' | 'bulges' | 'gouges_or_cuts' | 'weld_or_fire_damage' | 'corrosion_or_pitting' | 'relief_valve' | 'collar_and_foot_ring' | 'service_valve_and_seal' | 'locating_pin' | 'legible_markings'

export interface PrefillInspectionItem {
  key: PrefillInspectionKey
  label: string
  /** Where the item comes from: 'published' (PHMSA guidance) or 'from memory'. */
  basis: 'published' | 'from memory'
}

// Cylinder checks before refilling. Damage items: PHMSA guidance (published); fittings and markings:
// from memory, not checked against an official text.
export const PREFILL_INSPECTION_ITEMS: readonly PrefillInspectionItem[] = [
  { key: 'dents', label: 'No dents', basis: 'published' },
  { key: 'bulges', label: 'No bulges', basis: 'published' },
  { key: 'gouges_or_cuts', label: 'No gouges or cuts', basis: 'published' },
  { key: 'weld_or_fire_damage', label: 'No weld or fire damage', basis: 'published' },
  { key: 'corrosion_or_pitting', label: 'No harmful corrosion or pitting', basis: 'published' },
  { key: 'relief_valve', label: 'Relief valve in good order', basis: 'from memory' },
  { key: 'collar_and_foot_ring', label: 'Collar and foot ring sound', basis: 'from memory' },
  { key: 'service_valve_and_seal', label: 'Service valve and seal in good order', basis: 'from memory' },
  { key: 'locating_pin', label: 'Locating pin in place', basis: 'from memory' },
  { key: 'legible_markings', label: 'Markings legible', basis: 'from memory' },
]
