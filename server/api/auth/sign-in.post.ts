import { signInSchema } from '#shared/utils/auth-schemas'

// A hash of a random password, verified when the e-mail is unknown so that a wrong e-mail and a
// wrong password take the same time and get the same answer.
let decoyHash: Promise<string> | undefined
const VAGUE = 'That e-mail and password do not match an active account.'

// Sign in with e-mail and password; rate-limited per e-mail and per address.
export default defineEventHandler(async (event) => {
  const body = await validateBody(event, signInSchema)
  const keys = signInKeys(event, body.email)
  if (await tooManyFailures(keys)) {
    throw createError({ statusCode: 429, message: 'Too many tries. Wait 15 minutes, or ask an admin to check your account.' })
  }
  const [user] = await useDb().select().from(tables.users).where(eq(sql`lower(${tables.users.email})`, body.email))
  decoyHash ??= hashPassword(crypto.randomUUID())
  const ok = await verifyPassword(user?.passwordHash ?? await decoyHash, body.password)
  if (!user || !ok || !user.active) {
    await recordFailure(keys)
    throw createError({ statusCode: 401, message: VAGUE })
  }
  await clearFailures(keys)
  await startSession(event, user)
  const actor = await requireActor(event)
  return { user: actor.user, memberships: actor.memberships }
})
