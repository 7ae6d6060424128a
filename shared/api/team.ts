/** The team, its members and invites (`/api/team/*`, `/api/invites/:token`). */
import { z } from 'zod';
import { emailSchema, isoDateSchema, roleSchema, userRefSchema } from './common.ts';

export const memberSchema = z.object({
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  role: roleSchema,
  joinedAt: isoDateSchema,
});
export type Member = z.infer<typeof memberSchema>;

export const inviteSchema = z.object({
  id: z.string(),
  email: z.string(),
  role: roleSchema,
  createdAt: isoDateSchema,
  expiresAt: isoDateSchema,
  invitedBy: userRefSchema,
});
export type Invite = z.infer<typeof inviteSchema>;

/** GET /api/team. `invites` is empty for everyone but owners. */
export const teamResponseSchema = z.object({
  team: z.object({ id: z.string(), name: z.string() }),
  members: z.array(memberSchema),
  invites: z.array(inviteSchema),
});
export type TeamResponse = z.infer<typeof teamResponseSchema>;

/** POST /api/team/invites. */
export const createInviteRequestSchema = z.object({ email: emailSchema, role: roleSchema });
export type CreateInviteRequest = z.infer<typeof createInviteRequestSchema>;

/** GET /api/invites/:token (public): what the invite offers, shown on the sign-up page. */
export const inviteInfoSchema = z.object({
  email: z.string(),
  role: roleSchema,
  teamName: z.string(),
  expiresAt: isoDateSchema,
});
export type InviteInfo = z.infer<typeof inviteInfoSchema>;

/** PATCH /api/team/members/:userId. */
export const updateMemberRequestSchema = z.object({ role: roleSchema });
export type UpdateMemberRequest = z.infer<typeof updateMemberRequestSchema>;
