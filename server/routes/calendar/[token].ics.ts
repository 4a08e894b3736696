// A user's due list as iCalendar, at a private URL: /calendar/<token>.ics. No session needed; an
// unknown or revoked token answers 404.
export default defineAbilityHandler('calendar.feed', async (event) => {
  const raw = Object.values(getRouterParams(event, { decode: true }))[0] ?? ''
  const token = raw.endsWith('.ics') ? raw.slice(0, -4) : raw
  const owner = event.path.split('?')[0]!.endsWith('.ics') ? await feedOwner(token) : null
  if (!owner) throw createError({ statusCode: 404, message: 'No such calendar.' })
  const body = await calendarFeedIcs(owner)
  setResponseHeaders(event, {
    'content-type': 'text/calendar; charset=utf-8',
    'content-disposition': 'inline; filename="bayward-due.ics"',
    'cache-control': 'private, no-store',
    'referrer-policy': 'no-referrer',
  })
  return body
})
