import { z } from 'zod'

// Incident kinds, their names and the cautions the report form shows for each.

export const INCIDENT_KINDS = ['electrolyte_spill', 'damaged_battery', 'cylinder_leak', 'cylinder_damage', 'fire', 'near_miss', 'other'] as const
export type IncidentKind = typeof INCIDENT_KINDS[number]

export const INCIDENT_KIND_LABELS: Readonly<Record<IncidentKind, string>> = {
  electrolyte_spill: 'Electrolyte spill',
  damaged_battery: 'Damaged battery',
  cylinder_leak: 'Cylinder leak',
  cylinder_damage: 'Cylinder damage',
  fire: 'Fire',
  near_miss: 'Near miss',
  other: 'Other',
}

// Spill: neutralize with sodium bicarbonate to pH 7–9 (published spill guidance); PPE per 29 CFR
// 1910.133. Leaks and fire: the first steps every site posts.
export const INCIDENT_CAUTIONS: Readonly<Record<IncidentKind, readonly string[]>> = {
  electrolyte_spill: [
    'Goggles and face shield, acid-resistant gloves and apron before you go near the spill.',
    'Neutralize with sodium bicarbonate until it stops fizzing (pH 7–9), then absorb and collect it.',
    'Electrolyte on skin or in an eye: flush at the eyewash for 15 minutes and get first aid.',
  ],
  damaged_battery: [
    'Keep flames and sparks away: a damaged cell can vent hydrogen.',
    'PPE for electrolyte before handling; move it only with rated lifting equipment.',
  ],
  cylinder_leak: [
    'No switches, phones or engines near the leak; keep ignition sources away.',
    'If it is safe, close the service valve and move the cylinder outdoors; otherwise clear the area.',
  ],
  cylinder_damage: [
    'Do not fill or fit the cylinder: quarantine it in the cage.',
    'Gloves and eye protection: liquid propane causes cold burns.',
  ],
  fire: [
    'Raise the alarm and call the fire service first.',
    'Fight it only if it is small and you are trained, with the extinguisher for that fire.',
  ],
  near_miss: ['Make the place safe before you write it up.'],
  other: ['Make the place safe before you write it up.'],
}

export const incidentCreateSchema = z.object({
  siteId: z.uuid(),
  kind: z.enum(INCIDENT_KINDS, { error: 'Pick what happened.' }),
  areaId: z.uuid().nullable().default(null),
  assetCode: z.string().trim().max(40).default(''),
  at: z.iso.datetime({ offset: true }).optional(),
  description: z.string().trim().min(10, 'Say what happened (at least 10 characters).').max(4000),
  immediateActions: z.string().trim().max(4000).default(''),
  followUpOwnerId: z.uuid().nullable().default(null),
  photoUploadIds: z.array(z.uuid()).max(8).default([]),
})
export type IncidentInput = z.output<typeof incidentCreateSchema>
