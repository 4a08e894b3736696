// Send a person a link to set a new password (admins at any site the person belongs to). This is what an
// admin of one of their sites does instead of setting the password of someone who also works elsewhere.
export default defineAbilityHandler('user.manage', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const { actor, reach } = await requirePersonInReach(event, id, 'user.manage')
  const db = useDb()
  const [target] = await db.select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, active: tables.users.active })
    .from(tables.users).where(eq(tables.users.id, id))
  if (!target) throw codedError(404, 'no_such_person', 'No such person.')
  if (!target.active) throw codedError(409, 'account_deactivated', 'This account is deactivated; a link would not work. Ask an admin of all their sites to reactivate it.')
  if (!await countPasswordLinkRequest([`reset-email:${target.email.toLowerCase()}`])) {
    throw codedError(429, 'password_links_recent', 'Several links went to this person in the last 15 minutes. Ask them to check their mail, or wait and send again.')
  }
  await db.transaction(async (tx) => {
    await queuePasswordLink(tx, target, actor.user.name)
    await writeAudit(tx, { actor, siteId: reach[0]!, action: 'password_link_sent', entity: 'user', entityId: id })
  })
  deliverMailSoon()
  setResponseStatus(event, 202)
  return { ok: true, email: target.email, message: `A link to set a new password is on its way to ${target.email}. It works for 30 minutes, once.` }
})
