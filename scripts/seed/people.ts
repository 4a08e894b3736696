import { addCalendarInterval } from '../../shared/utils/due-dates'
import { SITE_TIME_ZONE, type Clock } from './clock'
import type { SeedContext, SiteContext, SiteKey, SitePeople } from './context'
import type { Random } from './random'
import type { AreaRow, SeedRows } from './rows'
import { DEMO_SIGN_INS } from './sign-ins'
import { defaultSiteSettings } from '../../shared/utils/site-settings'
import { defaultSgReferenceTempF } from '../../shared/utils/units'

export const DEMO_ORGANIZATION = 'Quillmere Cold Logistics'

type Role = 'operator' | 'technician' | 'facilities_lead' | 'safety_lead' | 'admin'
type QualificationKind = 'truck_class_1' | 'truck_class_2' | 'truck_class_3' | 'truck_class_4' | 'truck_class_5' | 'battery_changing' | 'lp_gas_transfer'

const MEMBERSHIPS: Record<string, Array<[SiteKey, Role]>> = {
  'operator@millbrook.example': [['mb', 'operator']],
  'technician@millbrook.example': [['mb', 'technician'], ['fx', 'technician']],
  'facilities@millbrook.example': [['mb', 'facilities_lead']],
  'safety@millbrook.example': [['mb', 'safety_lead']],
  'operator@fenwick.example': [['fx', 'operator']],
  'technician@fenwick.example': [['fx', 'technician']],
  'facilities@fenwick.example': [['fx', 'facilities_lead']],
  'safety@fenwick.example': [['fx', 'safety_lead']],
  'admin@quillmere.example': [['mb', 'admin'], ['fx', 'admin']],
}

const TRUCK_CLASSES: QualificationKind[] = ['truck_class_1', 'truck_class_2', 'truck_class_3', 'truck_class_4', 'truck_class_5']

// Areas with their size and ventilation; the fuel cage at Fenwick gets its storage limit after the cylinder history.
const AREAS: Array<{ site: SiteKey, kind: 'charging_area' | 'fuel_station', name: string, floor: number, volume: number | null, exhaust: number | null, lpLimit: number | null, notes: string }> = [
  { site: 'mb', kind: 'charging_area', name: 'North charge room', floor: 2400, volume: 43_200, exhaust: 2600, lpLimit: null, notes: 'Counterbalanced trucks: 48 V and 80 V, lithium-ion charger on the east wall.' },
  { site: 'mb', kind: 'charging_area', name: 'South charge room', floor: 1800, volume: 28_800, exhaust: 1900, lpLimit: null, notes: 'Reach trucks (36 V) and pallet trucks (24 V).' },
  { site: 'mb', kind: 'fuel_station', name: 'Dock 9 fuel cage', floor: 96, volume: null, exhaust: null, lpLimit: 2500, notes: 'Outdoor cage beside dock 9.' },
  { site: 'fx', kind: 'charging_area', name: 'Charge bay', floor: 1500, volume: 30_000, exhaust: 1650, lpLimit: null, notes: '' },
  { site: 'fx', kind: 'fuel_station', name: 'Yard fuel cage', floor: 80, volume: null, exhaust: null, lpLimit: 900, notes: 'Outdoor cage at the yard gate.' },
]

/** Each site's propane price per US gallon today (invented figures). */
export const PROPANE_PER_GAL: Record<SiteKey, number> = { mb: 2.85, fx: 2.95 }

export function buildOrganization(rows: SeedRows, newId: () => string, registeredAt: Date) {
  const organizationId = newId()
  rows.organizations.push({ id: organizationId, name: DEMO_ORGANIZATION, createdAt: registeredAt, updatedAt: registeredAt })
  const siteIds: Record<SiteKey, string> = { mb: newId(), fx: newId() }
  const siteNames: Record<SiteKey, string> = { mb: 'Millbrook DC', fx: 'Fenwick Cross-Dock' }
  for (const key of ['mb', 'fx'] as const) {
    rows.sites.push({
      id: siteIds[key],
      organizationId,
      name: siteNames[key],
      timeZone: SITE_TIME_ZONE,
      unitSystem: key === 'mb' ? 'us' : 'metric',
      // the metric site reads specific gravity against 25 °C (77 °F)
      // propane per US gallon: an invented figure
      settings: { ...defaultSiteSettings(), sgReferenceTempF: defaultSgReferenceTempF(key === 'mb' ? 'us' : 'metric'), propanePerGal: PROPANE_PER_GAL[key] },
      createdAt: registeredAt,
      updatedAt: registeredAt,
    })
  }
  const areas: AreaRow[] = AREAS.map(a => ({
    id: newId(),
    siteId: siteIds[a.site],
    kind: a.kind,
    name: a.name,
    floorAreaFt2: a.floor,
    roomVolumeFt3: a.volume,
    installedExhaustCfm: a.exhaust,
    lpStorageLimitLb: a.lpLimit,
    notes: a.notes,
    createdAt: registeredAt,
    updatedAt: registeredAt,
  }))
  rows.areas.push(...areas)
  return { siteIds, siteNames, areas }
}

export function buildPeople(rows: SeedRows, newId: () => string, clock: Clock, rand: Random, passwordHashes: string[], registeredAt: Date, siteIds: Record<SiteKey, string>) {
  const ids = new Map<string, string>()
  const homeSite = new Map<string, SiteKey>()
  DEMO_SIGN_INS.forEach((person, i) => {
    const id = newId()
    ids.set(person.email, id)
    const home = MEMBERSHIPS[person.email]?.[0]?.[0]
    if (home) homeSite.set(id, home)
    rows.users.push({ id, email: person.email, name: person.name, passwordHash: passwordHashes[i]!, createdAt: registeredAt, updatedAt: registeredAt })
    // memberships a second apart in the order listed: the first is the person's home site
    for (const [k, [site, role]] of (MEMBERSHIPS[person.email] ?? []).entries()) {
      const joined = new Date(registeredAt.getTime() + k * 1000)
      rows.memberships.push({ id: newId(), userId: id, siteId: siteIds[site], role, createdAt: joined, updatedAt: joined })
    }
  })
  const user = (email: string) => {
    const id = ids.get(email)
    if (!id) throw new Error(`no demo user ${email}`)
    return id
  }

  const today = clock.today
  const years = (date: string, n: number) => addCalendarInterval(date, n, 'year')
  const days = (n: number) => addCalendarInterval(today, n, 'day')
  // Each record is written by the safety lead of the person's home site, on the day of the evaluation (the
  // audit row is what the People page shows as "recorded by").
  const qualify = (userId: string, kind: QualificationKind, evaluatedOn: string, notes = '') => {
    const id = newId()
    const home = homeSite.get(userId) ?? 'mb'
    const at = new Date(`${evaluatedOn}T15:00:00Z`)
    rows.auditLog.push({ at, userId: user(`safety@${home === 'mb' ? 'millbrook' : 'fenwick'}.example`), siteId: siteIds[home], action: 'create', entity: 'qualification', entityId: id, after: { userId, kind, evaluatedOn } })
    rows.qualifications.push({
      id,
      userId,
      kind,
      trainedOn: addCalendarInterval(evaluatedOn, -rand.int(2, 9), 'day'),
      evaluatedOn,
      // Operators are evaluated at least every three years (29 CFR 1910.178(l)(4)(iii)).
      expiresOn: years(evaluatedOn, 3),
      notes,
      createdAt: registeredAt,
      updatedAt: registeredAt,
    })
  }

  const mbOperator = user('operator@millbrook.example')
  const mbOperatorEvaluated = days(-(365 + 214))
  for (const kind of TRUCK_CLASSES) qualify(mbOperator, kind, mbOperatorEvaluated)
  qualify(mbOperator, 'battery_changing', days(-300))

  // Fenwick operator: the truck evaluation runs out in about 20 days.
  const fxOperator = user('operator@fenwick.example')
  const fxOperatorEvaluated = addCalendarInterval(days(20), -3, 'year')
  for (const kind of TRUCK_CLASSES) qualify(fxOperator, kind, fxOperatorEvaluated, 'Re-evaluation to be booked.')
  qualify(fxOperator, 'battery_changing', days(-240))

  const mbTechnician = user('technician@millbrook.example')
  qualify(mbTechnician, 'lp_gas_transfer', days(-(365 + 100)), 'Cylinder filling by weight, practical and written.')
  qualify(mbTechnician, 'battery_changing', days(-410))
  qualify(mbTechnician, 'truck_class_1', days(-410))

  // Fenwick technician: LP-gas transfer evaluated more than three years ago, so it has lapsed.
  const fxTechnician = user('technician@fenwick.example')
  const fxLpEvaluated = addCalendarInterval(days(-75), -3, 'year')
  qualify(fxTechnician, 'lp_gas_transfer', fxLpEvaluated, 'Refresher not yet booked.')
  qualify(fxTechnician, 'battery_changing', days(-180))
  qualify(fxTechnician, 'truck_class_1', days(-180))

  const people = (site: 'millbrook' | 'fenwick'): SitePeople => ({
    operator: user(`operator@${site}.example`),
    technician: user(`technician@${site}.example`),
    facilities: user(`facilities@${site}.example`),
    safety: user(`safety@${site}.example`),
  })
  return {
    people: { mb: people('millbrook'), fx: people('fenwick') } as Record<SiteKey, SitePeople>,
    adminId: user('admin@quillmere.example'),
    lpRefillerId: mbTechnician,
    fenwickLpExpiredOn: years(fxLpEvaluated, 3),
  }
}

export function siteContexts(siteIds: Record<SiteKey, string>, siteNames: Record<SiteKey, string>, areas: AreaRow[], people: Record<SiteKey, SitePeople>): SeedContext['sites'] {
  const build = (key: SiteKey): SiteContext => {
    const own = areas.filter(a => a.siteId === siteIds[key])
    const fuelStation = own.find(a => a.kind === 'fuel_station')
    if (!fuelStation) throw new Error(`site ${key} has no fuel station`)
    return { key, id: siteIds[key], name: siteNames[key], people: people[key], chargingAreas: own.filter(a => a.kind === 'charging_area'), fuelStation }
  }
  return { mb: build('mb'), fx: build('fx') }
}
