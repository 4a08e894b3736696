import { z } from 'zod'

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().min(3, 'Enter your e-mail.').max(200).email('Enter your e-mail.'),
  password: z.string().min(1, 'Enter your password.').max(200),
})

export const passwordSchema = z.string().min(10, 'At least 10 characters.').max(200)

export const passwordLinkRequestSchema = z.object({
  email: signInSchema.shape.email,
})

// The token is checked against the database, so anything that is not a plausible token is simply unknown.
export const passwordLinkCompleteSchema = z.object({
  token: z.string().trim().min(1, 'The link is missing its token.').max(200, 'The link is missing its token.'),
  password: passwordSchema,
})

export const passwordChangeSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password.').max(200),
  newPassword: passwordSchema,
})

/** The answer to every request for a password link, whether or not the address has an account. */
export const PASSWORD_LINK_SENT = 'If that address belongs to an active account, a link to set a new password is on its way. It works for 30 minutes, once.'

export const PASSWORD_LINK_INVALID = 'This link has expired or was already used. Ask for a new one.'

export const PASSWORD_LINK_MINUTES = 30
