// Indoor carbon monoxide: 8-hour time-weighted average, mixture rule and the published limits.

export interface ExposureLimit {
  ppm: number
  source: string
}

export const CO_LIMITS = {
  /** 8-hour TWA permissible exposure limit. */
  oshaPel: { ppm: 50, source: 'OSHA PEL, 29 CFR 1910.1000 Table Z-1 (8-hour TWA)' },
  /** Recommended exposure limit, TWA (NIOSH applies it over a workday of up to 10 hours, from memory). */
  nioshRel: { ppm: 35, source: 'NIOSH REL (TWA)' },
  /** Never to be exceeded at any time. */
  nioshCeiling: { ppm: 200, source: 'NIOSH REL ceiling' },
  acgihTlv: { ppm: 25, source: 'ACGIH TLV (8-hour TWA)' },
  idlh: { ppm: 1200, source: 'NIOSH IDLH (immediately dangerous to life or health)' },
} as const satisfies Record<string, ExposureLimit>

export interface CoReading {
  ppm: number
  /** Hours the concentration lasted. */
  hours: number
}

export interface TimeWeightedAverage {
  /** Σ(C·T) / 8, in ppm. */
  twaPpm: number
  totalHours: number
  /** Hours of an 8-hour shift without a reading; the formula counts them as zero exposure. */
  unsampledHours: number
  /** More than 8 hours of readings: the OSHA formula still divides by 8, so the result overstates an 8-hour average. */
  exceedsEightHours: boolean
}

function checkReadings(readings: readonly CoReading[]): void {
  for (const r of readings) {
    if (!Number.isFinite(r.ppm) || r.ppm < 0) throw new RangeError(`CO reading must be 0 ppm or more, got ${r.ppm}`)
    if (!Number.isFinite(r.hours) || r.hours < 0) throw new RangeError(`reading duration must be 0 h or more, got ${r.hours}`)
  }
}

// 29 CFR 1910.1000(d)(1)(i): E = (Ca·Ta + Cb·Tb + … + Cn·Tn) / 8. The divisor stays 8 even when the
// readings cover more than 8 hours (as the regulation writes it); the result flags that case.
export function timeWeightedAverage8h(readings: readonly CoReading[]): TimeWeightedAverage {
  checkReadings(readings)
  const totalHours = readings.reduce((sum, r) => sum + r.hours, 0)
  const dose = readings.reduce((sum, r) => sum + r.ppm * r.hours, 0)
  return {
    twaPpm: dose / 8,
    totalHours,
    unsampledHours: Math.max(0, 8 - totalHours),
    exceedsEightHours: totalHours > 8,
  }
}

export interface MixturePart {
  concentration: number
  limit: number
}

// 29 CFR 1910.1000(d)(2)(i): E = C1/L1 + C2/L2 + … ; the mixture is over its limit when E exceeds 1.
export function mixtureExposure(parts: readonly MixturePart[]): number {
  return parts.reduce((sum, p) => {
    if (!(p.limit > 0)) throw new RangeError(`exposure limit must be above zero, got ${p.limit}`)
    if (!Number.isFinite(p.concentration) || p.concentration < 0) throw new RangeError(`concentration must be 0 or more, got ${p.concentration}`)
    return sum + p.concentration / p.limit
  }, 0)
}

export interface CoExposureAssessment extends TimeWeightedAverage {
  siteLimitPpm: number
  /** TWA above the OSHA PEL of 50 ppm. */
  overOshaPel: boolean
  /** TWA above the site's own limit (default 35 ppm, the NIOSH REL). */
  overSiteLimit: boolean
  /** Any single reading above the 200 ppm NIOSH ceiling. */
  ceilingExceeded: boolean
  /** Any single reading at or above 1,200 ppm IDLH. */
  atOrAboveIdlh: boolean
  peakPpm: number
}

// A limit is exceeded only when the value is above it; a TWA equal to the limit complies.
export function assessCoExposure(
  readings: readonly CoReading[],
  { siteLimitPpm = CO_LIMITS.nioshRel.ppm }: { siteLimitPpm?: number } = {},
): CoExposureAssessment {
  if (!(siteLimitPpm > 0)) throw new RangeError(`site CO limit must be above zero, got ${siteLimitPpm}`)
  const twa = timeWeightedAverage8h(readings)
  const peakPpm = readings.reduce((max, r) => Math.max(max, r.ppm), 0)
  return {
    ...twa,
    siteLimitPpm,
    overOshaPel: twa.twaPpm > CO_LIMITS.oshaPel.ppm,
    overSiteLimit: twa.twaPpm > siteLimitPpm,
    ceilingExceeded: readings.some(r => r.ppm > CO_LIMITS.nioshCeiling.ppm),
    atOrAboveIdlh: peakPpm >= CO_LIMITS.idlh.ppm,
    peakPpm,
  }
}
