export type Role = 'operator' | 'technician' | 'facilities_lead' | 'safety_lead' | 'admin'

export const ROLES: readonly Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']

export const ROLE_LABELS: Record<Role, string> = {
  operator: 'Operator',
  technician: 'Technician',
  facilities_lead: 'Facilities lead',
  safety_lead: 'Safety lead',
  admin: 'Admin',
}

export const LEAD_ROLES: readonly Role[] = ['facilities_lead', 'safety_lead', 'admin']

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
