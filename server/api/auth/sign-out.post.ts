// Sign out: the session is revoked on the server (a copy of the cookie stops working too) and the cookie cleared.
export default defineAbilityHandler('auth.sign-out', async (event) => {
  await endSession(event)
  return { ok: true }
})
