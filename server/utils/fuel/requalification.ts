import type { Actor } from '../auth'

// After a requalification: passed → the next date by method from the site table; failed → condemned.
export async function recordRequalification(actor: Actor, cylinder: FuelCylinderRow, input: { performedOn: string, method: FuelCylinderRow['lastRequalificationMethod'] & string, marking: string, passed: boolean, note: string }) {
  return useDb().transaction(async (tx) => {
    const [locked] = await tx.select().from(tables.lpCylinders).where(eq(tables.lpCylinders.id, cylinder.id)).for('update')
    if (!locked) throw codedError(404, 'no_such_cylinder', 'No such LP cylinder.')
    const facts = await fuelSiteFacts(tx, locked.siteId)
    if (input.performedOn > facts.today) throw createError({ statusCode: 400, message: 'The requalification date is in the future.', data: { code: 'requal_future_date', fields: { performedOn: 'Not after today.' } } })
    const made = `${locked.manufactureYear}-${String(locked.manufactureMonth).padStart(2, '0')}`
    if (input.performedOn.slice(0, 7) < made) throw createError({ statusCode: 400, message: 'The requalification date is before the cylinder was made.', data: { code: 'requal_before_made', params: { made }, fields: { performedOn: `Not before ${made}.` } } })
    if (locked.status === 'condemned') throw createError({ statusCode: 409, message: 'This cylinder is condemned; it cannot be requalified.', data: { code: 'requal_condemned' } })
    if (!input.passed && locked.status === 'in_use') throw createError({ statusCode: 409, message: 'This cylinder is on a truck. Take it off the truck first (a cylinder exchange).', data: { code: 'requal_on_truck' } })
    const suffix = REQUALIFICATION_MARK_SUFFIX[input.method]
    const marking = input.marking || `${input.performedOn.slice(5, 7)}-${input.performedOn.slice(2, 4)}${suffix ? ` ${suffix}` : ''}`
    if (suffix && !new RegExp(`\\b${suffix}\\b`).test(marking)) {
      throw createError({ statusCode: 400, message: `An ${REQUALIFICATION_METHOD_LABELS[input.method].toLowerCase()} is marked with "${suffix}" after the date.`, data: { code: 'requal_marking_suffix', params: { suffix }, fields: { marking: `Include "${suffix}" (49 CFR 180.209).` } } })
    }
    const nextDueOn = input.passed ? nextRequalificationDue(input.performedOn, input.method, requalificationYearsFromSettings(facts.settings)) : null
    const [row] = await tx.insert(tables.requalifications).values({
      siteId: locked.siteId, userId: actor.user.id, cylinderId: locked.id, performedOn: input.performedOn, method: input.method,
      marking, passed: input.passed, nextDueOn, note: input.note,
    }).returning()
    const newer = !locked.lastRequalifiedOn || input.performedOn >= locked.lastRequalifiedOn
    const patch: Partial<typeof tables.lpCylinders.$inferInsert> = input.passed
      ? (newer ? { lastRequalifiedOn: input.performedOn, lastRequalificationMethod: input.method } : {})
      : { status: 'condemned', outOfService: true, outOfServiceReason: `Condemned at requalification on ${input.performedOn}`, currentTruckId: null, statusChangedAt: new Date() }
    const [updated] = Object.keys(patch).length
      ? await tx.update(tables.lpCylinders).set(patch).where(eq(tables.lpCylinders.id, locked.id)).returning()
      : [locked]
    if (!input.passed) {
      await tx.insert(tables.assetHolds).values({ siteId: locked.siteId, userId: actor.user.id, assetKind: 'cylinder', assetId: locked.id, action: 'hold', reason: `Condemned at requalification on ${input.performedOn}` })
    }
    await writeAudit(tx, { actor, siteId: locked.siteId, action: input.passed ? 'requalification' : 'condemned', entity: 'requalification', entityId: row!.id, after: row })
    await recomputeSubjects(tx, locked.siteId, [{ kind: 'cylinder', id: locked.id }], { lock: false })
    return { item: row!, cylinder: updated!, requalification: cylinderRequalification(updated!, facts) }
  })
}
