// The outbox and the digest: a timer retries due messages and sends each site's daily digest at its
// hour; CO readings above the ceiling are mailed to the safety leads. Timers never hold the process open.
export default defineNitroPlugin((nitroApp) => {
  onCoCeilingExceeded(async (alert) => {
    await useDb().transaction(tx => notifyCoAboveCeiling(tx, alert))
    deliverMailSoon()
  })

  const seconds = Number(process.env.BAYWARD_MAIL_TICK_SECONDS ?? 60)
  if (!(seconds > 0)) return
  let running = false
  const tick = async () => {
    if (running) return
    running = true
    try {
      await deliverDueMail()
      if (process.env.BAYWARD_DIGEST_DISABLED !== 'true') await sendDigests()
    }
    catch (error) {
      console.error('mail timer', error)
    }
    finally {
      running = false
    }
  }
  const first = setTimeout(tick, 5_000)
  first.unref()
  const timer = setInterval(tick, seconds * 1000)
  timer.unref()
  nitroApp.hooks.hook('close', () => {
    clearTimeout(first)
    clearInterval(timer)
  })
})
