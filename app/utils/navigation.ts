import type { Role } from '#shared/types/auth'
import { can, type Ability } from '#shared/utils/abilities'

export type NavGroup = 'start' | 'battery' | 'fuel' | 'records' | 'fleet' | 'admin'

export interface NavItem {
  to: string
  label: string
  icon: string
  /** shown to whoever holds this ability at the current site (shared/utils/abilities.ts) */
  ability: Ability
  group: NavGroup
}

export const NAV_GROUP_LABELS: Record<NavGroup, string> = {
  start: '', battery: 'Battery room', fuel: 'Fuel station', records: 'Records', fleet: 'Fleet', admin: 'Admin',
}

// What each role uses, in the order they use it. Icons name paths in UiIcon.
export const NAV_ITEMS: NavItem[] = [
  { to: '/', label: 'Home', icon: 'home', ability: 'site.member', group: 'start' },
  { to: '/scan', label: 'Scan', icon: 'scan', ability: 'site.member', group: 'start' },
  { to: '/inspect', label: 'Pre-shift check', icon: 'clipboard', ability: 'inspection.record', group: 'start' },
  { to: '/bay', label: 'Bay board', icon: 'board', ability: 'site.member', group: 'battery' },
  { to: '/swap', label: 'Change battery', icon: 'swap', ability: 'swap.record', group: 'battery' },
  { to: '/charge', label: 'Charge', icon: 'plug', ability: 'charge.record', group: 'battery' },
  { to: '/check', label: 'Electrolyte check', icon: 'drop', ability: 'reading.record', group: 'battery' },
  { to: '/cage', label: 'Cylinder cage', icon: 'cage', ability: 'site.member', group: 'fuel' },
  { to: '/refill', label: 'Refill', icon: 'cylinder', ability: 'refill.record', group: 'fuel' },
  { to: '/exchange', label: 'Change cylinder', icon: 'swap', ability: 'cylinder.exchange', group: 'fuel' },
  { to: '/emissions', label: 'Emissions', icon: 'gauge', ability: 'emissions.view', group: 'fuel' },
  { to: '/co', label: 'CO readings', icon: 'cloud', ability: 'co.view', group: 'fuel' },
  { to: '/due', label: 'Due list', icon: 'list', ability: 'due.view-all', group: 'records' },
  { to: '/schedules', label: 'Schedules', icon: 'calendar', ability: 'schedule.edit', group: 'records' },
  { to: '/logs', label: 'Area logs', icon: 'clipboard', ability: 'log.view', group: 'records' },
  { to: '/incidents', label: 'Incidents', icon: 'flag', ability: 'incident.report', group: 'records' },
  { to: '/ventilation', label: 'Ventilation check', icon: 'fan', ability: 'report.view', group: 'records' },
  { to: '/reports', label: 'Reports', icon: 'chart', ability: 'report.view', group: 'records' },
  { to: '/trucks', label: 'Trucks', icon: 'truck', ability: 'site.member', group: 'fleet' },
  { to: '/batteries', label: 'Batteries', icon: 'battery', ability: 'asset.hold', group: 'fleet' },
  { to: '/chargers', label: 'Chargers', icon: 'plug', ability: 'asset.hold', group: 'fleet' },
  { to: '/cylinders', label: 'LP cylinders', icon: 'cylinder', ability: 'asset.hold', group: 'fleet' },
  { to: '/areas', label: 'Areas', icon: 'area', ability: 'asset.edit', group: 'fleet' },
  { to: '/labels', label: 'Label sheet', icon: 'tag', ability: 'label.print', group: 'fleet' },
  { to: '/people', label: 'People', icon: 'people', ability: 'user.view', group: 'admin' },
  { to: '/site', label: 'Site settings', icon: 'cog', ability: 'site.edit', group: 'admin' },
  { to: '/mail', label: 'Outgoing mail', icon: 'mail', ability: 'mail.manage', group: 'admin' },
  { to: '/calendar', label: 'Calendar feed', icon: 'calendar', ability: 'site.member', group: 'admin' },
]

export function navFor(roles: readonly Role[]): NavItem[] {
  return roles.length ? NAV_ITEMS.filter(item => can(roles, item.ability)) : []
}

/** The items grouped in order, each group with its heading (the first group has none). */
export function navGroups(items: NavItem[]): { group: NavGroup, label: string, items: NavItem[] }[] {
  const order = Object.keys(NAV_GROUP_LABELS) as NavGroup[]
  return order.map(group => ({ group, label: NAV_GROUP_LABELS[group], items: items.filter(i => i.group === group) })).filter(g => g.items.length)
}
