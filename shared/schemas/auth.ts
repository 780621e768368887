import { z } from 'zod';
import { organizationKinds, roles } from '../vocabulary';

export const emailSchema = z.string().trim().toLowerCase().email('Enter a valid e-mail address').max(254);

/** Common practice (NIST SP 800-63B leans on length, not composition rules). */
export const newPasswordSchema = z
  .string()
  .min(10, 'Use at least 10 characters')
  .max(200, 'Use at most 200 characters');

export const signInInput = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password').max(200),
});
export type SignInInput = z.infer<typeof signInInput>;

export const organizationSummarySchema = z.object({
  id: z.string().uuid(),
  kind: z.enum(organizationKinds),
  name: z.string(),
});
export type OrganizationSummary = z.infer<typeof organizationSummarySchema>;

export const sessionUserSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  name: z.string(),
  role: z.enum(roles),
  organization: organizationSummarySchema,
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const signInResponseSchema = z.object({
  accessToken: z.string(),
  user: sessionUserSchema,
});
export type SignInResponse = z.infer<typeof signInResponseSchema>;

/** GET /api/auth/me: the same user object, plus what it may do. */
export const meResponseSchema = sessionUserSchema.extend({
  permissions: z.array(z.string()),
});
export type MeResponse = z.infer<typeof meResponseSchema>;

export const forgotPasswordInput = z.object({ email: emailSchema });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordInput>;

export const resetPasswordInput = z.object({
  token: z.string().min(20, 'This link is not complete').max(200),
  password: newPasswordSchema,
});
export type ResetPasswordInput = z.infer<typeof resetPasswordInput>;

export const acceptInvitationInput = z.object({
  token: z.string().min(20, 'This link is not complete').max(200),
  name: z.string().trim().min(1, 'Enter your name').max(120),
  password: newPasswordSchema,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationInput>;

export const changePasswordInput = z.object({
  currentPassword: z.string().min(1, 'Enter your current password').max(200),
  newPassword: newPasswordSchema,
});
export type ChangePasswordInput = z.infer<typeof changePasswordInput>;

export const inviteStaffInput = z.object({
  email: emailSchema,
  name: z.string().trim().min(1, 'Enter a name').max(120),
  role: z.enum(roles),
});
export type InviteStaffInput = z.infer<typeof inviteStaffInput>;

export const staffMemberSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  name: z.string(),
  role: z.enum(roles),
  status: z.enum(['active', 'invited', 'disabled']),
  createdAt: z.string(),
});
export type StaffMember = z.infer<typeof staffMemberSchema>;

/** GET /api/auth/invitations/:token, so the accept page can greet the person. */
export const invitationPreviewSchema = z.object({
  email: z.string(),
  name: z.string(),
  role: z.enum(roles),
  organizationName: z.string(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;
