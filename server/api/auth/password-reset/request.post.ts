import { PASSWORD_LINK_SENT, passwordLinkRequestSchema } from '#shared/utils/auth-schemas'

// Ask for a link to set a new password. The answer is the same whether or not the address belongs
// to an active account, and whether or not the request was over the limit.
export default defineAbilityHandler('auth.password-reset', async (event) => {
  const { email } = await validateBody(event, passwordLinkRequestSchema)
  await sendPasswordLink(event, email)
  return { ok: true, message: PASSWORD_LINK_SENT }
})
