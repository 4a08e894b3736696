// Deterministic pseudo-random numbers (mulberry32), so every run builds the same demo fleet.
export function mulberry32(seed: number): () => number {
  let state = seed >>> 0
  return () => {
    state = (state + 0x6D2B79F5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

export class Random {
  private readonly next: () => number

  constructor(seed: number) {
    this.next = mulberry32(seed)
  }

  float(): number {
    return this.next()
  }

  between(min: number, max: number): number {
    return min + (max - min) * this.next()
  }

  /** Whole number from min to max, both included. */
  int(min: number, max: number): number {
    return min + Math.floor(this.next() * (max - min + 1))
  }

  chance(probability: number): boolean {
    return this.next() < probability
  }

  pick<T>(items: readonly T[]): T {
    if (items.length === 0) throw new RangeError('cannot pick from an empty list')
    return items[Math.floor(this.next() * items.length)]!
  }

  /** A shuffled copy (Fisher–Yates). */
  shuffle<T>(items: readonly T[]): T[] {
    const copy = [...items]
    for (let i = copy.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1))
      const held = copy[i]!
      copy[i] = copy[j]!
      copy[j] = held
    }
    return copy
  }

  /** A value rounded to a number of decimals, as an instrument would show it. */
  reading(min: number, max: number, decimals: number): number {
    return roundTo(this.between(min, max), decimals)
  }
}

export function roundTo(value: number, decimals: number): number {
  const factor = 10 ** decimals
  return Math.round(value * factor) / factor
}

// Version-4 layout UUIDs drawn from their own stream, so row ids stay the same from run to run.
export function uuidFactory(seed: number): () => string {
  const next = mulberry32(seed)
  return () => {
    const bytes = Array.from({ length: 16 }, () => Math.floor(next() * 256))
    bytes[6] = (bytes[6]! & 0x0F) | 0x40
    bytes[8] = (bytes[8]! & 0x3F) | 0x80
    const hex = bytes.map(b => b.toString(16).padStart(2, '0')).join('')
    return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`
  }
}
