// Input schemas for sign-in, accounts and user administration, shared by forms and the server.
import { z } from 'zod';
import { ROLES } from '../permissions';

export const MIN_PASSWORD_LENGTH = 12;

// A short list of passwords that attackers try first; long enough to catch the usual suspects.
const COMMON_PASSWORDS = new Set([
  '123456789012',
  '1234567890123',
  'passwordpassword',
  'password1234',
  'password12345',
  'password123456',
  'qwertyuiopas',
  'qwertyuiop12',
  'qwerty123456',
  '111111111111',
  '000000000000',
  'letmeinletmein',
  'iloveyou1234',
  'adminadmin12',
  'administrator',
  'welcome12345',
  'welcomewelcome',
  'changeme1234',
  'abc123abc123',
  'abcdefghijkl',
  'trustno1trustno1',
  'monkeymonkey',
  'dragondragon',
  'baseball1234',
  'football1234',
  'sunshine1234',
  'princess1234',
  'superman1234',
  'beadpath1234',
  'beadpath-demo',
  'passw0rdpassw0rd',
  'p@ssw0rd1234',
  '1q2w3e4r5t6y',
  'zaq12wsxcde3',
  'asdfghjkl123',
  'masterkey123',
]);

export const Email = z
  .string({ error: 'E-mail is required' })
  .trim()
  .min(3, 'E-mail is required')
  .max(254, 'E-mail is too long')
  .pipe(z.email({ error: 'E-mail must look like name@example.com' }))
  .transform((e) => e.toLowerCase());

export const NewPassword = z
  .string({ error: 'Password is required' })
  .min(MIN_PASSWORD_LENGTH, `Password must be at least ${MIN_PASSWORD_LENGTH} characters`)
  .max(200, 'Password must be at most 200 characters')
  .refine((p) => !COMMON_PASSWORDS.has(p.toLowerCase()), 'This password is too common: choose another');

export const LoginInput = z.object({
  email: Email,
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(200, 'Password is too long'),
});
export type LoginInput = z.output<typeof LoginInput>;

export const ChangePasswordInput = z
  .object({
    currentPassword: z.string({ error: 'Current password is required' }).min(1, 'Current password is required'),
    newPassword: NewPassword,
  })
  .refine((v) => v.currentPassword !== v.newPassword, {
    path: ['newPassword'],
    message: 'New password must differ from the current one',
  });
export type ChangePasswordInput = z.output<typeof ChangePasswordInput>;

export const AcceptInviteInput = z.object({
  token: z.string().min(20, 'Invitation link is incomplete').max(200),
  password: NewPassword,
});

export const RoleList = z
  .array(z.enum(ROLES, { error: `Roles must be among ${ROLES.join(', ')}` }), { error: 'Roles are required' })
  .min(1, 'Choose at least one role')
  .transform((r) => [...new Set(r)]);

export const InviteUserInput = z.object({
  name: z.string({ error: 'Name is required' }).trim().min(1, 'Name is required').max(120, 'Name is too long'),
  email: Email,
  roles: RoleList,
});
export type InviteUserInput = z.output<typeof InviteUserInput>;

export const UpdateUserInput = z
  .object({
    name: z.string().trim().min(1, 'Name is required').max(120, 'Name is too long').optional(),
    roles: RoleList.optional(),
    active: z.boolean({ error: 'Active must be true or false' }).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change' });
export type UpdateUserInput = z.output<typeof UpdateUserInput>;

export const UpdateProfileInput = z.object({
  name: z.string().trim().min(1, 'Name is required').max(120).optional(),
  /** null: follow the organisation's default. */
  unitSystem: z.enum(['metric', 'imperial'], { error: 'Unit system must be metric, imperial or null (the organisation default)' }).nullable().optional(),
});

export const IdParam = z.object({ id: z.coerce.number({ error: 'Id must be a number' }).int().positive('Id must be a positive whole number') });

export interface SessionUser {
  id: number;
  email: string;
  name: string;
  roles: (typeof ROLES)[number][];
  /** The system the user sees: their own choice, or the organisation's default when they made none. */
  unitSystem: 'metric' | 'imperial';
  /** Where unitSystem comes from. */
  unitSystemSource: 'own' | 'organisation';
  /** The organisation's default, shown beside the choice on the account page. */
  organisationUnitSystem: 'metric' | 'imperial';
  organisationId: number;
  organisationName: string;
}
