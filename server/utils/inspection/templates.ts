import type { z } from 'zod'
import {
  DEFAULT_INSPECTION_ITEMS, DEFAULT_INSPECTION_TITLES, INSPECTION_POWERS, inspectionPowerOf,
  type InspectionPower, type inspectionTemplateSaveSchema,
} from '#shared/utils/truck-inspection'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

export type InspectionTemplateRow = typeof tables.truckInspectionTemplates.$inferSelect

// The pre-shift checklists of a site, one per power type, versioned like the area checklists: a save adds
// a version and retires the one before; a record keeps the id of the version it was made on.

export async function activeInspectionTemplate(db: DbOrTx, siteId: string, power: InspectionPower): Promise<InspectionTemplateRow | null> {
  const t = tables.truckInspectionTemplates
  const [row] = await db.select().from(t).where(and(eq(t.siteId, siteId), eq(t.power, power), eq(t.active, true))).orderBy(desc(t.version)).limit(1)
  return row ?? null
}

/** The checklist a truck of this power is inspected on: the active version, or the defaults as version 1. */
export async function ensureInspectionTemplate(db: DbOrTx, siteId: string, truckPower: string): Promise<InspectionTemplateRow> {
  const power = inspectionPowerOf(truckPower)
  const found = await activeInspectionTemplate(db, siteId, power)
  if (found) return found
  const [row] = await db.insert(tables.truckInspectionTemplates)
    .values({ siteId, power, title: DEFAULT_INSPECTION_TITLES[power], items: [...DEFAULT_INSPECTION_ITEMS[power]], version: 1, active: true })
    .onConflictDoNothing().returning()
  return row ?? (await activeInspectionTemplate(db, siteId, power))!
}

/** Both checklists for a site (the demo seed and a new site). */
export async function seedInspectionTemplates(db: DbOrTx, siteId: string) {
  for (const power of INSPECTION_POWERS) await ensureInspectionTemplate(db, siteId, power)
}

// A new version of a power type's checklist (leads).
export async function saveInspectionTemplate(actor: Actor, siteId: string, input: z.output<typeof inspectionTemplateSaveSchema>) {
  return useDb().transaction(async (tx) => {
    const t = tables.truckInspectionTemplates
    const previous = await tx.select().from(t).where(and(eq(t.siteId, siteId), eq(t.power, input.power))).orderBy(desc(t.version)).for('update')
    const current = previous.find(p => p.active) ?? null
    if (previous.length) await tx.update(t).set({ active: false }).where(and(eq(t.siteId, siteId), eq(t.power, input.power)))
    const [row] = await tx.insert(t).values({ siteId, power: input.power, title: input.title, items: input.items, version: (previous[0]?.version ?? 0) + 1, active: true }).returning()
    await writeAudit(tx, { actor, siteId, action: 'create', entity: 'truck_inspection_template', entityId: row!.id, before: current ? { version: current.version, items: current.items } : null, after: { version: row!.version, items: row!.items } })
    return row!
  })
}
