import type { Role } from '#shared/types/auth'

export interface NavItem {
  to: string
  label: string
  icon: string
  roles: readonly Role[]
}

const everyone: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
const floor: Role[] = ['technician', 'facilities_lead', 'safety_lead', 'admin']
const leads: Role[] = ['facilities_lead', 'safety_lead', 'admin']

// What each role uses, in the order they use it. Icons name paths in UiIcon.
export const NAV_ITEMS: NavItem[] = [
  { to: '/', label: 'Home', icon: 'home', roles: everyone },
  { to: '/scan', label: 'Scan', icon: 'scan', roles: everyone },
  { to: '/bay', label: 'Bay board', icon: 'area', roles: everyone },
  { to: '/swap', label: 'Change battery', icon: 'battery', roles: everyone },
  { to: '/charge', label: 'Charge', icon: 'plug', roles: floor },
  { to: '/check', label: 'Electrolyte check', icon: 'search', roles: floor },
  { to: '/trucks', label: 'Trucks', icon: 'truck', roles: everyone },
  { to: '/batteries', label: 'Batteries', icon: 'battery', roles: floor },
  { to: '/chargers', label: 'Chargers', icon: 'plug', roles: floor },
  { to: '/cylinders', label: 'LP cylinders', icon: 'cylinder', roles: floor },
  { to: '/cage', label: 'Cylinder cage', icon: 'cylinder', roles: everyone },
  { to: '/emissions', label: 'Emissions', icon: 'truck', roles: leads },
  { to: '/co', label: 'CO readings', icon: 'alert', roles: ['technician', 'facilities_lead', 'safety_lead', 'admin'] },
  { to: '/due', label: 'Due list', icon: 'alert', roles: leads },
  { to: '/logs', label: 'Area logs', icon: 'search', roles: floor },
  { to: '/incidents', label: 'Incidents', icon: 'alert', roles: everyone },
  { to: '/ventilation', label: 'Ventilation check', icon: 'area', roles: ['safety_lead', 'facilities_lead', 'admin'] },
  { to: '/calendar', label: 'Calendar feed', icon: 'tag', roles: everyone },
  { to: '/areas', label: 'Areas', icon: 'area', roles: leads },
  { to: '/labels', label: 'Label sheet', icon: 'tag', roles: leads },
  { to: '/people', label: 'People', icon: 'people', roles: ['admin', 'safety_lead', 'facilities_lead'] },
  { to: '/site', label: 'Site settings', icon: 'cog', roles: ['admin'] },
]

export function navFor(roles: readonly Role[]): NavItem[] {
  return NAV_ITEMS.filter(item => item.roles.some(r => roles.includes(r)))
}
