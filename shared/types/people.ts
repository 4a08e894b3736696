import type { Role } from './auth'
import type { QUALIFICATION_LABELS } from '../utils/admin-schemas'

/** A training record as the People page shows it, with who recorded it and when (from the audit log). */
export interface PersonQualification {
  id: string
  kind: keyof typeof QUALIFICATION_LABELS
  trainedOn: string
  evaluatedOn: string | null
  expiresOn: string
  recordedBy: string | null
  recordedAt: string | null
}

/** One row of GET /api/users: the person, their roles at the site, and what the caller may do about them. */
export interface PersonRow {
  id: string
  email: string
  name: string
  active: boolean
  roles: Role[]
  qualifications: PersonQualification[]
  may: { changeAccount: boolean, sendLink: boolean, assignRoles: boolean, recordTraining: boolean }
}
