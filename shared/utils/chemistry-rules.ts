import type { BatteryChemistry, FitReason } from './battery-fit'

// How the trade runs each battery chemistry, in one place: the read models (cool-down), the charge and
// electrolyte acts (what is accepted) and the screens (what is offered) all ask here.
//
// Lithium-ion (LFP traction packs): no rest after a charge before use, charged in the truck during breaks
// ("opportunity charging"), sealed cells with no electrolyte to read or water and no equalize charge; the pack's
// battery management system needs the charger's lithium-ion profile (battery makers' manuals, common practice).
// Lead-acid (flooded, AGM, gel) keeps the site's cool-down and is charged out of the truck.

/** Whether the chemistry is a sealed lithium-ion pack. */
export const isLithiumIon = (chemistry: BatteryChemistry | string): boolean => chemistry === 'lithium_ion'

/** Minutes a battery rests after a complete charge before it reads Ready: 0 for lithium-ion, else the site's cool-down. */
export function coolDownMinutesFor(chemistry: BatteryChemistry | string, siteCoolDownMinutes: number): number {
  return isLithiumIon(chemistry) ? 0 : siteCoolDownMinutes
}

/** Whether a battery of this chemistry may go on charge while it sits in a truck (opportunity charging). */
export const chargesInTruck = (chemistry: BatteryChemistry | string): boolean => isLithiumIon(chemistry)

/** Whether electrolyte checks (level, watering, hydrometer readings) apply to this chemistry. */
export const takesElectrolyteReadings = (chemistry: BatteryChemistry | string): boolean => !isLithiumIon(chemistry)

/** Whether an equalize charge applies to this chemistry. */
export const takesEqualize = (chemistry: BatteryChemistry | string): boolean => !isLithiumIon(chemistry)

/** The refusal of an electrolyte check on a battery that has no electrolyte to read. */
export const NO_ELECTROLYTE_READING: FitReason = {
  code: 'no_electrolyte_reading',
  params: { chemistry: 'lithium_ion' },
  message: 'A lithium-ion battery has sealed cells: no electrolyte level, watering or specific-gravity reading. Check its charge on the battery display.',
}

/** The refusal of an equalize charge on a battery that takes none. */
export const NO_EQUALIZE: FitReason = {
  code: 'no_equalize',
  params: { chemistry: 'lithium_ion' },
  message: 'A lithium-ion battery takes no equalize charge; its battery management system balances the cells.',
}

/**
 * A lithium-ion battery on a charger that records no chemistry profiles at all: allowed, with this warning (a
 * charger that records profiles and lacks lithium-ion is refused by chargerBatteryMatch).
 */
export const CHARGER_PROFILE_UNRECORDED: FitReason = {
  code: 'charger_profile_unrecorded',
  params: { chemistry: 'lithium_ion' },
  message: 'This charger records no charging profiles: make sure it is set to its lithium-ion profile before connecting.',
}
