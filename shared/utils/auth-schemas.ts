import { z } from 'zod'

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().min(3, 'Enter your e-mail.').max(200).email('Enter your e-mail.'),
  password: z.string().min(1, 'Enter your password.').max(200),
})

export const passwordSchema = z.string().min(10, 'At least 10 characters.').max(200)
