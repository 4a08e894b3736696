import { waterGramsPerAmpHourPerCell } from './faraday'

/** Highest electrolyte temperature at the end of a charge, °F (from memory: keep under about 110–115 °F). */
export const DEFAULT_MAX_CHARGE_TEMP_F = 115

/** Deepest discharge before a traction battery should go on charge, percent (common practice). */
export const DEFAULT_MAX_DEPTH_OF_DISCHARGE_PERCENT = 80

/** Share of rated capacity a charge must return to count as a cycle (common practice, kept simple). */
export const COUNTED_CYCLE_MIN_FRACTION = 0.2

/** One US fluid ounce in millilitres (1/128 US gallon of 231 in³). */
export const US_FLUID_OUNCE_ML = 29.5735295625

/** Energy drawn from the grid for a charge, kWh: Ah × V / 1000 / charger efficiency. */
export function gridEnergyKwh(ampHoursReturned: number, batteryVoltage: number, chargerEfficiency: number): number {
  if (!(chargerEfficiency > 0 && chargerEfficiency <= 1)) {
    throw new RangeError(`Charger efficiency must be above 0 and at most 1; got ${chargerEfficiency}.`)
  }
  if (!(ampHoursReturned >= 0) || !(batteryVoltage > 0)) {
    throw new RangeError('Amp-hours returned must be zero or more and battery voltage above zero.')
  }
  return ampHoursReturned * batteryVoltage / 1000 / chargerEfficiency
}

/** Cost of grid energy at a tariff per kWh (same currency as the tariff, unrounded). */
export function energyCost(kwh: number, tariffPerKwh: number): number {
  return kwh * tariffPerKwh
}

/** True when the end-of-charge temperature is above the limit (at the limit is not hot). */
export function ranHot(endTempF: number, maxTempF: number = DEFAULT_MAX_CHARGE_TEMP_F): boolean {
  return endTempF > maxTempF
}

/**
 * Depth of discharge estimated from the amp-hours the charger put back, percent of rated capacity.
 * Amp-hours returned include the charge's own overcharge, so this reads somewhat high.
 */
export function depthOfDischargePercent(ampHoursReturned: number, ratedAh: number): number {
  if (!(ratedAh > 0)) throw new RangeError(`Rated capacity must be above 0 Ah; got ${ratedAh}.`)
  return ampHoursReturned / ratedAh * 100
}

/** True when a discharge went deeper than the limit (80 % by default, common practice). */
export function exceedsDepthOfDischarge(
  ampHoursReturned: number,
  ratedAh: number,
  maxPercent: number = DEFAULT_MAX_DEPTH_OF_DISCHARGE_PERCENT,
): boolean {
  return depthOfDischargePercent(ampHoursReturned, ratedAh) > maxPercent + 1e-9
}

/** Grams of water a battery loses to electrolysis over an overcharge (Faraday's law, one H2O per H2). */
export function overchargeWaterLossGrams(overchargeAh: number, cells: number): number {
  return overchargeAh * cells * waterGramsPerAmpHourPerCell()
}

/** The same water loss in US fluid ounces, taking water at 1 g/mL. */
export function overchargeWaterLossFluidOunces(overchargeAh: number, cells: number): number {
  return overchargeWaterLossGrams(overchargeAh, cells) / US_FLUID_OUNCE_ML
}

export interface ChargeCycleFacts {
  complete: boolean
  /** Null when the charger does not report amp-hours. */
  ampHoursReturned: number | null
  ratedAh: number
}

/**
 * Whether a charge counts toward the battery's cycle count (common practice, kept simple):
 * it counts when it put back at least 20 % of rated capacity, complete or not, so short top-ups
 * do not inflate the count; without an amp-hour figure, a complete charge counts.
 */
export function isCountedCycle(charge: ChargeCycleFacts): boolean {
  if (charge.ampHoursReturned === null || !Number.isFinite(charge.ampHoursReturned)) return charge.complete
  if (!(charge.ratedAh > 0)) return charge.complete
  return charge.ampHoursReturned >= charge.ratedAh * COUNTED_CYCLE_MIN_FRACTION - 1e-9
}
