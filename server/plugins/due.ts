// CO readings above the ceiling are mailed to the safety leads. (The outbox's retries and the daily
// digest are scheduled jobs: server/plugins/queue.ts.)
export default defineNitroPlugin(() => {
  onCoCeilingExceeded(async (alert) => {
    await useDb().transaction(tx => notifyCoAboveCeiling(tx, alert))
    deliverMailSoon()
  })
})
