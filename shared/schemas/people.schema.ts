import { z } from 'zod';
import { farmRoles, locales } from './auth.schema';

export const personSchema = z.object({
  userId: z.uuid(),
  email: z.string(),
  name: z.string(),
  role: z.enum(farmRoles),
  active: z.boolean(),
  /** True until the person has set a password from their invitation. */
  invited: z.boolean(),
  lastLoginAt: z.string().nullable(),
  memberSince: z.string(),
});
export type Person = z.infer<typeof personSchema>;

export const inviteRequestSchema = z.object({
  email: z.email().max(254),
  name: z.string().trim().min(1, 'Enter a name').max(120),
  role: z.enum(farmRoles),
  locale: z.enum(locales).default('en'),
});
export type InviteRequest = z.infer<typeof inviteRequestSchema>;

export const updatePersonSchema = z
  .object({ role: z.enum(farmRoles).optional(), active: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.active !== undefined, { message: 'Change the role or the active flag' });
