import { z } from 'zod';
import { RoleSchema } from './roles.js';
import { PasswordSchema } from './password-policy.js';

export const EmailSchema = z.string().trim().toLowerCase().email('enter a valid e-mail address').max(200);

export const LoginSchema = z.object({
  email: EmailSchema,
  password: z.string().min(1, 'enter your password').max(200),
  totp: z.string().regex(/^\d{6}$/, 'the code has 6 digits').optional(),
});
export type LoginInput = z.infer<typeof LoginSchema>;

export const SessionUserSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  displayName: z.string(),
  roles: z.array(RoleSchema),
  isChair: z.boolean(),
  siteIds: z.array(z.string().uuid()),
  totpEnabled: z.boolean(),
  mustEnrollTotp: z.boolean(),
});
export type SessionUser = z.infer<typeof SessionUserSchema>;

export const MeResponseSchema = z.object({
  user: SessionUserSchema,
  csrfToken: z.string(),
  demoMode: z.boolean(),
  idleMinutes: z.number(),
});
export type MeResponse = z.infer<typeof MeResponseSchema>;

export const UserCreateSchema = z.object({
  email: EmailSchema,
  displayName: z.string().trim().min(1, 'enter a display name').max(80),
  roles: z.array(RoleSchema).min(1, 'choose at least one role'),
  isChair: z.boolean().default(false),
  siteIds: z.array(z.string().uuid()).default([]),
});
export type UserCreate = z.infer<typeof UserCreateSchema>;

export const UserUpdateSchema = UserCreateSchema.omit({ email: true }).partial().extend({ active: z.boolean().optional() });
export type UserUpdate = z.infer<typeof UserUpdateSchema>;

export const UserSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  displayName: z.string(),
  roles: z.array(RoleSchema),
  isChair: z.boolean(),
  siteIds: z.array(z.string().uuid()),
  active: z.boolean(),
  totpEnabled: z.boolean(),
  invitePending: z.boolean(),
  lockedUntil: z.string().nullable(),
  createdAt: z.string(),
});
export type User = z.infer<typeof UserSchema>;

export const PasswordResetRequestSchema = z.object({ email: EmailSchema });
export const PasswordResetConfirmSchema = z.object({
  token: z.string().min(20, 'the link is incomplete: open it again from the e-mail').max(200),
  password: PasswordSchema,
});
export const TotpConfirmSchema = z.object({ code: z.string().regex(/^\d{6}$/, 'the code has 6 digits') });
