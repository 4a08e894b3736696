import type { AssetKind } from '#shared/utils/asset-schemas'

/**
 * Where each asset kind's pages live (/batteries). The asset pages' route validators read only this: a
 * validator goes into the app's entry chunk, and the asset views (ASSET_VIEWS) would bring the schemas, and zod
 * with them, into every page's first load.
 */
export const ASSET_PATHS: Readonly<Record<AssetKind, string>> = {
  truck: '/trucks', battery: '/batteries', charger: '/chargers', cylinder: '/cylinders', area: '/areas',
}

/** The asset kind a list path (/batteries) shows, or undefined. */
export function kindForPath(collection: unknown): AssetKind | undefined {
  return (Object.keys(ASSET_PATHS) as AssetKind[]).find(kind => ASSET_PATHS[kind] === `/${String(collection)}`)
}
