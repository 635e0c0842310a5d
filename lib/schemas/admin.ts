import { z } from 'zod';
import { ROLES } from '@/lib/roles';

export const USER_SORTS = ['name', 'email', 'role', 'created_at', 'last_sign_in_at'] as const;

export const userListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  role: z.enum(ROLES).optional(),
  sort: z.enum(USER_SORTS).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(5).max(100).default(10),
});
export type UserListQueryInput = z.input<typeof userListQuerySchema>;

export const userPatchSchema = z
  .object({ role: z.enum(ROLES).optional(), disabled: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, { message: 'Change the role or the disabled flag.' });
export type UserPatchInput = z.infer<typeof userPatchSchema>;

export const mailIdParamSchema = z.object({ id: z.coerce.number().int().positive() });
