import { z } from 'zod'
import { email, password } from './fields'

export const loginSchema = z.object({
  email,
  password: z.string().min(1, { error: 'enter your password' }).max(200),
})
export type LoginInput = z.infer<typeof loginSchema>

export const forgotSchema = z.object({ email })
export type ForgotInput = z.infer<typeof forgotSchema>

export const tokenQuerySchema = z.object({ token: z.string().min(20).max(200) })
export type TokenQuery = z.infer<typeof tokenQuerySchema>

export const setPasswordSchema = z.object({
  token: z.string().min(20, { error: 'the link is incomplete' }).max(200),
  password,
  name: z.string().trim().min(2).max(120).optional(),
})
export type SetPasswordInput = z.infer<typeof setPasswordSchema>

export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, { error: 'enter your current password' }).max(200),
    newPassword: password,
  })
  .refine(x => x.currentPassword !== x.newPassword, {
    error: 'must differ from the current password',
    path: ['newPassword'],
  })
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>

/** Signing out; `everywhere` ends every session of the person, on every device. */
export const logoutSchema = z.object({ everywhere: z.boolean().default(false) })
export type LogoutInput = z.infer<typeof logoutSchema>
