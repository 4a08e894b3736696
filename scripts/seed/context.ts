import type { SiteSettings } from '../../shared/utils/site-settings'
import type { Clock } from './clock'
import type { Random } from './random'
import type { AreaRow, SeedRows } from './rows'

export type SiteKey = 'mb' | 'fx'

export interface SitePeople {
  operator: string
  technician: string
  facilities: string
  safety: string
}

export interface SiteContext {
  key: SiteKey
  id: string
  name: string
  people: SitePeople
  chargingAreas: AreaRow[]
  fuelStation: AreaRow
}

export interface SeedContext {
  clock: Clock
  rand: Random
  newId: () => string
  settings: SiteSettings
  rows: SeedRows
  adminId: string
  /** Millbrook technician, who also fills cylinders at Fenwick once the Fenwick technician's LP-gas evaluation lapsed. */
  lpRefillerId: string
  /** Day the Fenwick technician's LP-gas transfer qualification expired. */
  fenwickLpExpiredOn: string
  sites: Record<SiteKey, SiteContext>
  /** When the assets were registered in Bayward, before the year of history. */
  registeredAt: Date
  /** Files for the uploads storage (certificates), written once the rows naming them have committed. */
  files: Array<{ key: string, bytes: Uint8Array }>
}
