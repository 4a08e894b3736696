import { z } from 'zod'
import { ROLES } from '../types/auth'
import { passwordSchema } from './auth-schemas'
import { isoDateSchema } from './iso-date'

export const QUALIFICATION_KINDS = [
  'truck_class_1', 'truck_class_2', 'truck_class_3', 'truck_class_4', 'truck_class_5', 'truck_class_6', 'truck_class_7',
  'battery_changing', 'lp_gas_transfer',
] as const
export const QUALIFICATION_LABELS: Record<typeof QUALIFICATION_KINDS[number], string> = {
  truck_class_1: 'Truck class 1', truck_class_2: 'Truck class 2', truck_class_3: 'Truck class 3',
  truck_class_4: 'Truck class 4', truck_class_5: 'Truck class 5', truck_class_6: 'Truck class 6',
  truck_class_7: 'Truck class 7', battery_changing: 'Battery changing', lp_gas_transfer: 'LP-gas transfer',
}

const isoDate = isoDateSchema

const siteFields = {
  name: z.string().trim().min(2, 'Name the site.').max(80),
  address: z.string().trim().max(200),
  timeZone: z.string().trim().min(3).max(60).refine(tz => Intl.supportedValuesOf('timeZone').includes(tz) || tz === 'UTC', 'Pick a time zone such as America/Chicago.'),
  unitSystem: z.enum(['us', 'metric']),
}
export const siteCreateSchema = z.object({
  ...siteFields,
  address: siteFields.address.default(''),
  timeZone: siteFields.timeZone.default('America/Chicago'),
  unitSystem: siteFields.unitSystem.default('us'),
})
// No defaults here: a PATCH changes only the keys it sends.
export const siteUpdateSchema = z.object(siteFields).partial().extend({
  settings: z.record(z.string(), z.unknown()).optional(),
})

export const userCreateSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(200),
  name: z.string().trim().min(2, 'Enter a name.').max(100),
  password: passwordSchema,
  siteId: z.uuid('Pick a site.'),
  roles: z.array(z.enum(ROLES)).min(1, 'Give at least one role.'),
})

export const userUpdateSchema = z.object({
  name: z.string().trim().min(2, 'Enter a name.').max(100).optional(),
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(200).optional(),
  active: z.boolean().optional(),
  password: passwordSchema.optional(),
})

export const userRolesSchema = z.object({
  siteId: z.uuid('Pick a site.'),
  roles: z.array(z.enum(ROLES)),
})

export const qualificationCreateSchema = z.object({
  kind: z.enum(QUALIFICATION_KINDS, { error: 'Pick what the training covers.' }),
  trainedOn: isoDate,
  evaluatedOn: isoDate.nullable().default(null),
  expiresOn: isoDate,
  notes: z.string().trim().max(500).default(''),
}).refine(q => q.expiresOn > q.trainedOn, { path: ['expiresOn'], message: 'Expires after it was trained.' })
