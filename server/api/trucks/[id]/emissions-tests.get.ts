// A truck's emissions tests, newest first, with the certificate file of each (anyone at its site).
export default defineAbilityHandler('site.member', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const { truck } = await requireCombustionTruck(event, id)
  const e = tables.emissionsTests
  const items = await useDb().select({
    id: e.id, testedOn: e.testedOn, testerName: e.testerName, coIdlePct: e.coIdlePct, coHighIdlePct: e.coHighIdlePct,
    hcPpm: e.hcPpm, co2Pct: e.co2Pct, o2Pct: e.o2Pct, idleRpm: e.idleRpm, highIdleRpm: e.highIdleRpm, passed: e.passed,
    reasons: e.reasons, nextDueOn: e.nextDueOn, note: e.note, recordedBy: tables.users.name,
    certificate: { id: tables.uploads.id, displayName: tables.uploads.displayName, contentType: tables.uploads.contentType },
  }).from(e)
    .innerJoin(tables.users, eq(tables.users.id, e.userId))
    .leftJoin(tables.uploads, eq(tables.uploads.id, e.certificateUploadId))
    .where(eq(e.truckId, truck.id))
    .orderBy(desc(e.testedOn), desc(e.recordedAt))
  return { items: items.map(i => ({ ...i, certificate: i.certificate?.id ? i.certificate : null })) }
})
