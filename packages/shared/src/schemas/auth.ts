import { z } from 'zod';
import { emailSchema, passwordSchema, requiredText } from './common.js';
import type { Role } from '../terms/roles.js';
import { roleSchema } from './roles.js';

export const signUpSchema = z.object({
  firmName: requiredText(120, 'Firm name'),
  ownerName: requiredText(120, 'Your name'),
  email: emailSchema,
  password: passwordSchema,
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, { message: 'Enter your password' }).max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const forgotPasswordSchema = z.object({ email: emailSchema });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordSchema>;

const tokenSchema = z.string().trim().min(20, { message: 'This link is not valid' }).max(200);

export const resetPasswordSchema = z.object({ token: tokenSchema, password: passwordSchema });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;

export const acceptInviteSchema = z.object({
  token: tokenSchema,
  name: requiredText(120, 'Your name'),
  password: passwordSchema,
});
export type AcceptInviteInput = z.infer<typeof acceptInviteSchema>;

export const inviteSchema = z.object({
  email: emailSchema,
  name: requiredText(120, 'Name'),
  role: roleSchema,
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const changeRoleSchema = z.object({ role: roleSchema });
export type ChangeRoleInput = z.infer<typeof changeRoleSchema>;

export interface SessionUser {
  id: string;
  name: string;
  email: string;
}
export interface SessionFirm {
  id: string;
  name: string;
}
export interface SessionDto {
  accessToken: string;
  expiresIn: number;
  user: SessionUser;
  firm: SessionFirm;
  role: Role;
  crewIds: string[];
}

export interface MemberDto {
  id: string;
  userId: string;
  name: string;
  email: string;
  role: Role;
  status: 'active' | 'invited';
  crewIds: string[];
  createdAt: string;
}
