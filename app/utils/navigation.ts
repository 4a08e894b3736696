import type { Role } from '#shared/types/auth'

export type NavGroup = 'start' | 'battery' | 'fuel' | 'records' | 'fleet' | 'admin'

export interface NavItem {
  to: string
  label: string
  icon: string
  roles: readonly Role[]
  group: NavGroup
}

export const NAV_GROUP_LABELS: Record<NavGroup, string> = {
  start: '', battery: 'Battery room', fuel: 'Fuel station', records: 'Records', fleet: 'Fleet', admin: 'Admin',
}

const everyone: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
const floor: Role[] = ['technician', 'facilities_lead', 'safety_lead', 'admin']
const leads: Role[] = ['facilities_lead', 'safety_lead', 'admin']

// What each role uses, in the order they use it. Icons name paths in UiIcon.
export const NAV_ITEMS: NavItem[] = [
  { to: '/', label: 'Home', icon: 'home', roles: everyone, group: 'start' },
  { to: '/scan', label: 'Scan', icon: 'scan', roles: everyone, group: 'start' },
  { to: '/bay', label: 'Bay board', icon: 'board', roles: everyone, group: 'battery' },
  { to: '/swap', label: 'Change battery', icon: 'swap', roles: everyone, group: 'battery' },
  { to: '/charge', label: 'Charge', icon: 'plug', roles: floor, group: 'battery' },
  { to: '/check', label: 'Electrolyte check', icon: 'drop', roles: floor, group: 'battery' },
  { to: '/cage', label: 'Cylinder cage', icon: 'cage', roles: everyone, group: 'fuel' },
  { to: '/refill', label: 'Refill', icon: 'cylinder', roles: floor, group: 'fuel' },
  { to: '/exchange', label: 'Change cylinder', icon: 'swap', roles: everyone, group: 'fuel' },
  { to: '/emissions', label: 'Emissions', icon: 'gauge', roles: leads, group: 'fuel' },
  { to: '/co', label: 'CO readings', icon: 'cloud', roles: ['technician', 'facilities_lead', 'safety_lead', 'admin'], group: 'fuel' },
  { to: '/due', label: 'Due list', icon: 'list', roles: leads, group: 'records' },
  { to: '/schedules', label: 'Schedules', icon: 'calendar', roles: leads, group: 'records' },
  { to: '/logs', label: 'Area logs', icon: 'clipboard', roles: floor, group: 'records' },
  { to: '/incidents', label: 'Incidents', icon: 'flag', roles: everyone, group: 'records' },
  { to: '/ventilation', label: 'Ventilation check', icon: 'fan', roles: ['safety_lead', 'facilities_lead', 'admin'], group: 'records' },
  { to: '/trucks', label: 'Trucks', icon: 'truck', roles: everyone, group: 'fleet' },
  { to: '/batteries', label: 'Batteries', icon: 'battery', roles: floor, group: 'fleet' },
  { to: '/chargers', label: 'Chargers', icon: 'plug', roles: floor, group: 'fleet' },
  { to: '/cylinders', label: 'LP cylinders', icon: 'cylinder', roles: floor, group: 'fleet' },
  { to: '/areas', label: 'Areas', icon: 'area', roles: leads, group: 'fleet' },
  { to: '/labels', label: 'Label sheet', icon: 'tag', roles: leads, group: 'fleet' },
  { to: '/people', label: 'People', icon: 'people', roles: ['admin', 'safety_lead', 'facilities_lead'], group: 'admin' },
  { to: '/site', label: 'Site settings', icon: 'cog', roles: ['admin'], group: 'admin' },
  { to: '/calendar', label: 'Calendar feed', icon: 'calendar', roles: everyone, group: 'admin' },
]

export function navFor(roles: readonly Role[]): NavItem[] {
  return NAV_ITEMS.filter(item => item.roles.some(r => roles.includes(r)))
}

/** The items grouped in order, each group with its heading (the first group has none). */
export function navGroups(items: NavItem[]): { group: NavGroup, label: string, items: NavItem[] }[] {
  const order = Object.keys(NAV_GROUP_LABELS) as NavGroup[]
  return order.map(group => ({ group, label: NAV_GROUP_LABELS[group], items: items.filter(i => i.group === group) })).filter(g => g.items.length)
}
