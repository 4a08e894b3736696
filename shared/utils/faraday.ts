// Electrochemistry of a lead-acid cell on overcharge: every 2 electrons split one water molecule
// into one H2 and half an O2 (Faraday's law).

/** Faraday constant, C/mol (CODATA 2018 exact value: e × N_A). */
export const FARADAY_C_PER_MOL = 96485.33212
/** Molar gas constant, J/(mol·K) (CODATA 2018 exact value). */
export const GAS_CONSTANT_J_PER_MOL_K = 8.314462618
/** Molar mass of water, g/mol (IUPAC standard atomic weights). */
export const WATER_G_PER_MOL = 18.015
/** One standard atmosphere, Pa. */
export const STANDARD_ATMOSPHERE_PA = 101325

/** Moles of H2 one cell evolves per ampere-hour of overcharge: 3600 C / (2 F). */
export function hydrogenMolPerAmpHourPerCell(): number {
  return 3600 / (2 * FARADAY_C_PER_MOL)
}

/** Grams of water one cell loses per ampere-hour of overcharge (one H2O per H2). */
export function waterGramsPerAmpHourPerCell(): number {
  return hydrogenMolPerAmpHourPerCell() * WATER_G_PER_MOL
}

/** Volume of an ideal gas in litres at a temperature (°C) and pressure (Pa). */
export function idealGasLitres(mol: number, celsius: number, pascal = STANDARD_ATMOSPHERE_PA): number {
  return (mol * GAS_CONSTANT_J_PER_MOL_K * (celsius + 273.15) / pascal) * 1000
}

/** Litres of H2 per ampere-hour per cell at a temperature (°C), 1 atm. */
export function hydrogenLitresPerAmpHourPerCell(celsius = 25): number {
  return idealGasLitres(hydrogenMolPerAmpHourPerCell(), celsius)
}
