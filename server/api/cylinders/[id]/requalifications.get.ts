// A cylinder's requalification history with its markings, and when it is due next (anyone at its site).
export default defineAbilityHandler('site.member', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const { row } = await findAssetForActor(event, 'cylinder', id)
  const db = useDb()
  const items = await db.select({
    id: tables.requalifications.id, performedOn: tables.requalifications.performedOn, method: tables.requalifications.method,
    marking: tables.requalifications.marking, passed: tables.requalifications.passed, nextDueOn: tables.requalifications.nextDueOn,
    note: tables.requalifications.note, recordedBy: tables.users.name,
  }).from(tables.requalifications)
    .innerJoin(tables.users, eq(tables.users.id, tables.requalifications.userId))
    .where(eq(tables.requalifications.cylinderId, id))
    .orderBy(desc(tables.requalifications.performedOn), desc(tables.requalifications.at))
  const cylinder = row as unknown as FuelCylinderRow
  return { items, requalification: cylinderRequalification(cylinder, await fuelSiteFacts(db, cylinder.siteId)) }
})
