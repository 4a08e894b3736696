import type { BatteryChemistry } from './battery-fit'

/** Reference temperature and correction rate for hydrometer readings (a site setting). */
export interface SpecificGravityPolicy {
  referenceTempF: number
  correctionPerDegF: number
}

/**
 * Add 0.004 per 10 °F above the reference, subtract below, referenced to 80 °F.
 * Published in several battery and engine manuals; 80 °F reference as in US Army TM 5-1185.
 */
export const DEFAULT_SG_POLICY: SpecificGravityPolicy = {
  referenceTempF: 80,
  correctionPerDegF: 0.004 / 10,
}

/** IEEE 450 practice: 0.001 per 3 °F from 77 °F (from memory, not checked against the standard's text). */
export const IEEE450_SG_POLICY: SpecificGravityPolicy = {
  referenceTempF: 77,
  correctionPerDegF: 0.001 / 3,
}

/** Cell-to-cell spread that signals trouble on a motive battery after an equalize (common practice). */
export const DEFAULT_CELL_SPREAD_THRESHOLD = 0.020

/** Lowest and highest specific gravity accepted from a hydrometer entry. */
export const SG_ENTRY_MIN = 1.000
export const SG_ENTRY_MAX = 1.400

/** Volts per cell on open circuit ≈ specific gravity + 0.84 (published in a truck maker's manual). */
export const OPEN_CIRCUIT_VOLTS_OVER_SG = 0.84

/**
 * State of charge against specific gravity corrected to 80 °F, US Army TM 5-1185:
 * 1.280 full, 1.250 = 75 %, 1.220 = 50 %, 1.190 = 25 %, 1.160 nearly flat, 1.130 discharged.
 * "Nearly flat" carries no percentage in the table; it is left out and falls at 12.5 % on the
 * straight line from 1.190 (25 %) to 1.130 (0 %).
 */
export const SG_STATE_OF_CHARGE_TABLE: ReadonlyArray<{ sg: number, percent: number }> = [
  { sg: 1.130, percent: 0 },
  { sg: 1.190, percent: 25 },
  { sg: 1.220, percent: 50 },
  { sg: 1.250, percent: 75 },
  { sg: 1.280, percent: 100 },
]

/** A hydrometer reading corrected to the policy's reference temperature (unrounded). */
export function correctedSpecificGravity(
  reading: number,
  electrolyteTempF: number,
  policy: SpecificGravityPolicy = DEFAULT_SG_POLICY,
): number {
  return reading + (electrolyteTempF - policy.referenceTempF) * policy.correctionPerDegF
}

/** Three-decimal text for a specific gravity, as a hydrometer is read. */
export function formatSpecificGravity(sg: number): string {
  return sg.toFixed(3)
}

/** Percent state of charge (0–100) from a corrected specific gravity, interpolating the TM 5-1185 table. */
export function stateOfChargeFromSpecificGravity(correctedSg: number): number {
  const table = SG_STATE_OF_CHARGE_TABLE
  const first = table[0]!
  const last = table[table.length - 1]!
  if (correctedSg <= first.sg) return first.percent
  if (correctedSg >= last.sg) return last.percent
  for (let i = 1; i < table.length; i++) {
    const low = table[i - 1]!
    const high = table[i]!
    if (correctedSg <= high.sg) {
      return low.percent + (correctedSg - low.sg) / (high.sg - low.sg) * (high.percent - low.percent)
    }
  }
  return last.percent
}

/** Open-circuit volts per lead-acid cell from its specific gravity. */
export function openCircuitVoltsPerCell(sg: number): number {
  return sg + OPEN_CIRCUIT_VOLTS_OVER_SG
}

/** Specific gravity estimated from open-circuit volts per lead-acid cell. */
export function specificGravityFromOpenCircuitVolts(voltsPerCell: number): number {
  return voltsPerCell - OPEN_CIRCUIT_VOLTS_OVER_SG
}

/**
 * Nominal volts per cell: 2.0 for lead-acid (flooded, AGM, gel; common practice);
 * 3.2 for lithium-ion, taken as lithium iron phosphate (from memory).
 */
export function nominalVoltsPerCell(chemistry: BatteryChemistry): number {
  return chemistry === 'lithium_ion' ? 3.2 : 2.0
}

/** Cells in series for a nominal voltage (48 V lead-acid → 24), or null when it is not a whole number of cells. */
export function cellCountForNominalVoltage(voltage: number, chemistry: BatteryChemistry): number | null {
  if (!Number.isFinite(voltage) || voltage <= 0) return null
  const cells = voltage / nominalVoltsPerCell(chemistry)
  const whole = Math.round(cells)
  return whole >= 1 && Math.abs(cells - whole) < 1e-9 ? whole : null
}

export type SpecificGravityEntry = { ok: true, value: number } | { ok: false, message: string }

/**
 * Forgiving keypad entry of a hydrometer reading: '1.280', '1,280', '1.28', and the decimal point
 * left out ('1280' → 1.280, '128' → 1.28); refuses anything outside 1.000–1.400.
 */
export function parseSpecificGravityEntry(text: string): SpecificGravityEntry {
  const typed = text.trim().replace(/\s+/g, '')
  if (typed === '') {
    return { ok: false, message: 'Enter the specific gravity, for example 1.280.' }
  }
  const normalized = typed.replace(',', '.')
  let value: number
  if (/^\d+\.\d*$|^\.\d+$/.test(normalized)) {
    value = Number(normalized)
  }
  else if (/^1\d{0,4}$/.test(normalized)) {
    value = Number(`1.${normalized.slice(1) || '0'}`)
  }
  else if (/^\d+$/.test(normalized)) {
    value = Number(normalized)
  }
  else {
    return { ok: false, message: `"${text.trim()}" is not a specific gravity; enter it like 1.280.` }
  }
  if (!Number.isFinite(value) || value < SG_ENTRY_MIN || value > SG_ENTRY_MAX) {
    return { ok: false, message: `${value} is outside 1.000–1.400; read the float again.` }
  }
  return { ok: true, value }
}

/** Mean, extremes and low cells of one battery's specific-gravity readings. */
export interface CellSpread {
  mean: number
  max: number
  min: number
  spread: number
  /** 1-based cell numbers reading below the mean by more than the threshold. */
  lowCells: number[]
}

/**
 * Spread between cells of one battery (readings already temperature-corrected, cell 1 first).
 * Returns null for no readings; a single reading has no spread and no low cell.
 */
export function cellSpread(
  readings: number[],
  lowCellThreshold: number = DEFAULT_CELL_SPREAD_THRESHOLD,
): CellSpread | null {
  if (readings.length === 0) return null
  if (readings.some(r => !Number.isFinite(r))) {
    throw new RangeError('Every specific-gravity reading must be a number.')
  }
  const mean = readings.reduce((sum, r) => sum + r, 0) / readings.length
  const max = Math.max(...readings)
  const min = Math.min(...readings)
  // A small allowance so a cell exactly at the threshold is not counted low through float error.
  const lowCells = readings
    .map((r, i) => ({ cell: i + 1, below: mean - r }))
    .filter(c => c.below > lowCellThreshold + 1e-9)
    .map(c => c.cell)
  return { mean, max, min, spread: max - min, lowCells }
}
