import type { AssetKind } from '#shared/utils/asset-schemas'
import type { DbOrTx } from './db'

export const TAG_PREFIX: Record<AssetKind, string> = { battery: 'B', charger: 'C', cylinder: 'L', truck: 'T', area: 'A' }

// Next code for a prefix. The counter row is locked by the UPDATE until the creating transaction
// ends, so concurrent creations queue and a rolled-back creation gives its number back: no gaps,
// no duplicates.
export async function nextTagCode(tx: DbOrTx, kind: AssetKind): Promise<string> {
  const prefix = TAG_PREFIX[kind]
  const [row] = await tx.execute<{ last: number }>(sql`
    INSERT INTO tag_counters (prefix, last) VALUES (${prefix}, 1)
    ON CONFLICT (prefix) DO UPDATE SET last = tag_counters.last + 1
    RETURNING last`)
  return `${prefix}-${String(row!.last).padStart(5, '0')}`
}

export async function issueTag(tx: DbOrTx, kind: AssetKind, assetId: string, siteId: string): Promise<string> {
  const code = await nextTagCode(tx, kind)
  await tx.insert(tables.tags).values({ code, assetKind: kind, assetId, siteId })
  return code
}
