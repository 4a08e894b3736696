// The roles a person can hold at a site, lowest to highest (one list: the pgEnum and the zod schemas take it).
export const ROLES = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin'] as const
export type Role = typeof ROLES[number]

export const ROLE_LABELS: Record<Role, string> = {
  operator: 'Operator',
  technician: 'Technician',
  facilities_lead: 'Facilities lead',
  safety_lead: 'Safety lead',
  admin: 'Admin',
}

export interface SiteMembership {
  siteId: string
  siteName: string
  roles: Role[]
}

export interface SessionUser {
  id: string
  email: string
  name: string
}
