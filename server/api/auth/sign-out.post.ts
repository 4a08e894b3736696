// Sign out: clears the sealed session cookie.
export default defineEventHandler(async (event) => {
  forgetOpenedSession(event)
  await clearUserSession(event)
  return { ok: true }
})
