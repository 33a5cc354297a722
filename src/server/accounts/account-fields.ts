import { z } from 'zod';
import { roles } from '../storage/store.ts';

/** Rules for account fields, shared by the API and the admin command. */
export const usernameSchema = z
  .string({ error: 'username must be text' })
  .trim()
  .min(2, 'username must be 2 to 40 characters')
  .max(40, 'username must be 2 to 40 characters')
  .regex(/^[A-Za-z0-9._-]+$/, 'username may hold letters, digits, dot, dash and underscore only');

export const personNameSchema = z.string({ error: 'name must be text' }).trim().min(1, 'name is required').max(80, 'name must be at most 80 characters');

/** At least 10 characters (a passphrase); at most 200 so hashing time stays bounded. */
export const passwordSchema = z.string({ error: 'password must be text' }).min(10, 'password must be 10 to 200 characters').max(200, 'password must be 10 to 200 characters');

export const roleSchema = z.enum(roles, { error: `role must be one of ${roles.join(', ')}` });
