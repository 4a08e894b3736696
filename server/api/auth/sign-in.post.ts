import { signInSchema } from '#shared/utils/auth-schemas'

// A hash of a random password, verified when the e-mail is unknown so that a wrong e-mail and a
// wrong password take the same time and get the same answer.
let decoyHash: Promise<string> | undefined
const VAGUE = 'That e-mail and password do not match an active account.'

// Sign in with e-mail and password. The attempt is counted (per e-mail and per address) before the
// password is checked, so parallel guesses cannot get past the limit; a success no longer counts.
export default defineAbilityHandler('auth.sign-in', async (event) => {
  const body = await validateBody(event, signInSchema)
  const keys = signInKeys(event, body.email)
  const attempt = await claimAttempt(keys, signInLimit())
  if (!attempt) throw codedError(429, 'too_many_tries', TOO_MANY_TRIES)
  const [user] = await useDb().select().from(tables.users).where(eq(sql`lower(${tables.users.email})`, body.email))
  decoyHash ??= hashPassword(crypto.randomUUID())
  const ok = await verifyPassword(user?.passwordHash ?? await decoyHash, body.password)
  if (!user || !ok || !user.active) throw codedError(401, 'sign_in_no_match', VAGUE)
  await releaseAttempt(attempt)
  await clearFailures(keys)
  await startSession(event, user)
  const actor = await requireActor(event)
  return { user: actor.user, memberships: actor.memberships }
})
