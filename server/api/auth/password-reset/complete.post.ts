import { PASSWORD_LINK_INVALID, passwordLinkCompleteSchema } from '#shared/utils/auth-schemas'

// Set a new password with the token from the e-mailed link. Every session signed in before stops working.
export default defineAbilityHandler('auth.password-reset', async (event) => {
  const { token, password } = await validateBody(event, passwordLinkCompleteSchema)
  if (!await redeemPasswordLink(token, password)) {
    throw createError({ statusCode: 400, message: PASSWORD_LINK_INVALID, data: { code: 'password_link_invalid', fields: { token: PASSWORD_LINK_INVALID } } })
  }
  return { ok: true, message: 'Your new password is set. Sign in with it.' }
})
