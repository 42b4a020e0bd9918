import { z } from 'zod';
import { labelText } from './text.js';

/** Roles from least to most powerful: each one may do everything the ones before it may. */
export const ROLES = ['viewer', 'technician', 'admin'] as const;
export const RoleSchema = z.enum(ROLES);
export type Role = z.infer<typeof RoleSchema>;

/** True when `role` is at least `minRole` (admin ⊇ technician ⊇ viewer). */
export function roleAtLeast(role: Role, minRole: Role): boolean {
  return ROLES.indexOf(role) >= ROLES.indexOf(minRole);
}

/** Shortest password we accept; long passphrases beat complexity rules. */
export const PASSWORD_MIN_LENGTH = 10;
/** Longest password we hash, so a huge body cannot make scrypt work for nothing. */
export const PASSWORD_MAX_LENGTH = 200;

export const PasswordSchema = z.string().min(PASSWORD_MIN_LENGTH).max(PASSWORD_MAX_LENGTH);
export const EmailSchema = z.email().max(254).transform((email) => email.toLowerCase());

/** A user as the API shows it (never the password hash). */
export const PublicUserSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: RoleSchema,
  disabled: z.boolean(),
});
export type PublicUser = z.infer<typeof PublicUserSchema>;

/** POST /api/auth/login */
export const LoginRequestSchema = z.object({
  email: EmailSchema,
  password: z.string().min(1).max(PASSWORD_MAX_LENGTH),
});
export type LoginRequest = z.infer<typeof LoginRequestSchema>;

/** POST /api/auth/login answer: the user and a fresh CSRF token (the session is regenerated). */
export const LoginResponseSchema = z.object({ user: PublicUserSchema, csrfToken: z.string() });

/** POST /api/auth/password */
export const ChangePasswordRequestSchema = z.object({
  currentPassword: z.string().min(1).max(PASSWORD_MAX_LENGTH),
  newPassword: PasswordSchema,
});

/** POST /api/users (admin) */
export const CreateUserRequestSchema = z.object({
  email: EmailSchema,
  name: labelText(120),
  role: RoleSchema,
  password: PasswordSchema,
});
export type CreateUserRequest = z.infer<typeof CreateUserRequestSchema>;

/** PATCH /api/users/:id (admin): set role, rename, disable or enable. */
export const UpdateUserRequestSchema = z
  .object({
    name: labelText(120).optional(),
    role: RoleSchema.optional(),
    disabled: z.boolean().optional(),
  })
  .strict()
  .refine((body) => Object.keys(body).length > 0, { message: 'Nothing to change' });
export type UpdateUserRequest = z.infer<typeof UpdateUserRequestSchema>;
