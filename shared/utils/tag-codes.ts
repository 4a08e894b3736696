import type { AssetKind } from './asset-schemas'

export const TAG_KIND_BY_PREFIX: Record<string, AssetKind> = { B: 'battery', C: 'charger', L: 'cylinder', T: 'truck', A: 'area' }
export const TAG_DIGITS = 5

// What a person types or a camera reads, turned into a tag code: "b12", "B 00012", "b-00012" and
// "https://…/t/B-00012" all give "B-00012". Anything else is null.
export function normalizeTagCode(input: string): string | null {
  let text = input.trim()
  const fromUrl = /\/t\/([^/?#\s]+)/i.exec(text)
  if (fromUrl) text = decodeURIComponent(fromUrl[1]!)
  const m = /^([BCLTA])\s*-?\s*(\d{1,9})$/i.exec(text.replace(/\s+/g, ' '))
  if (!m) return null
  return `${m[1]!.toUpperCase()}-${m[2]!.padStart(TAG_DIGITS, '0')}`
}

export function tagKind(code: string): AssetKind | null {
  return TAG_KIND_BY_PREFIX[code[0] ?? ''] ?? null
}

/** The URL a tag's QR symbol encodes. */
export function tagUrl(baseUrl: string, code: string): string {
  return `${baseUrl.replace(/\/+$/, '')}/t/${code}`
}
