import { z } from 'zod';

export const emailSchema = z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address.' }));

// Length over composition rules (NIST SP 800-63B §5.1.1.2: at least 8, allow at least 64).
export const newPasswordSchema = z
  .string()
  .min(10, { message: 'Use at least 10 characters.' })
  .max(200, { message: 'Use at most 200 characters.' });

export const personNameSchema = z
  .string()
  .trim()
  .min(2, { message: 'Enter your name (at least 2 characters).' })
  .max(100, { message: 'Use at most 100 characters.' });

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, { message: 'Enter your password.' }).max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const tokenSchema = z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, { message: 'The link is not valid.' });

export const acceptInvitationSchema = z.object({
  token: tokenSchema,
  name: personNameSchema,
  password: newPasswordSchema,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

/** Form shape with the repeated password; the API receives `acceptInvitationSchema`. */
export const setPasswordFormSchema = z
  .object({ password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { message: 'The passwords differ.', path: ['confirm'] });

export const requestResetSchema = z.object({ email: emailSchema });
export type RequestResetInput = z.infer<typeof requestResetSchema>;

export const completeResetSchema = z.object({ token: tokenSchema, password: newPasswordSchema });
export type CompleteResetInput = z.infer<typeof completeResetSchema>;

export const joinInvitationSchema = z.object({ token: tokenSchema });
