/** Sign-up, sign-in and the signed-in identity (`/api/auth/*`). */
import { z } from 'zod';
import { emailSchema, personNameSchema, roleSchema } from './common.ts';

/** Passwords: at least 10 characters (a passphrase is encouraged), at most 200. */
export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 200;
export const passwordSchema = z
  .string()
  .min(PASSWORD_MIN, `Password must be at least ${PASSWORD_MIN} characters`)
  .max(PASSWORD_MAX, `Password must be at most ${PASSWORD_MAX} characters`);

export const teamNameSchema = z.string().trim().min(1, 'Team name is required').max(100, 'Team name is at most 100 characters');

/** POST /api/auth/sign-up. Without `inviteToken` a new team `teamName` is created with the user as owner. */
export const signUpRequestSchema = z
  .object({
    name: personNameSchema,
    email: emailSchema,
    password: passwordSchema,
    teamName: teamNameSchema.optional(),
    inviteToken: z.string().min(1).max(200).optional(),
  })
  .superRefine((v, ctx) => {
    if (!v.inviteToken && !v.teamName) {
      ctx.addIssue({ code: 'custom', path: ['teamName'], message: 'Team name is required' });
    }
  });
export type SignUpRequest = z.infer<typeof signUpRequestSchema>;

/**
 * Answer to a sign-up that creates a new team (202): the same whether or not the address already
 * has an account. A mail to the address either holds the link that finishes the sign-up or says an
 * account exists.
 */
export const signUpPendingSchema = z.object({ status: z.literal('check-inbox'), email: z.string() });
export type SignUpPending = z.infer<typeof signUpPendingSchema>;

/** POST /api/auth/sign-up/confirm: the token from the mailed link; answers 201 with `Me` and a session. */
export const signUpConfirmRequestSchema = z.object({ token: z.string().min(1, 'The link is incomplete').max(200) });
export type SignUpConfirmRequest = z.infer<typeof signUpConfirmRequestSchema>;

/** POST /api/auth/sign-in. */
export const signInRequestSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Password is required').max(PASSWORD_MAX, `Password must be at most ${PASSWORD_MAX} characters`),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

/** The signed-in user, their team and role (GET /api/auth/me, and the answer to sign-up/sign-in). */
export const meSchema = z.object({
  user: z.object({ id: z.string(), name: z.string(), email: z.string() }),
  team: z.object({ id: z.string(), name: z.string() }),
  role: roleSchema,
});
export type Me = z.infer<typeof meSchema>;

/** GET /api/auth/demo: the demo accounts, listed on the sign-in page while demo mode is on. */
export const demoInfoSchema = z.object({
  demo: z.boolean(),
  accounts: z.array(z.object({ email: z.string(), role: roleSchema, password: z.string() })),
});
export type DemoInfo = z.infer<typeof demoInfoSchema>;
