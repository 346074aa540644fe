import { z } from 'zod';
import { hasSomeField } from './patch';

/** Body of `POST /api/admin/users`; without a password the person gets a set-password e-mail. */
export const createUserBodySchema = z
  .object({
    email: z
      .string()
      .trim()
      .toLowerCase()
      .max(254)
      .email({ message: 'This is not a valid e-mail address.' }),
    name: z.string().trim().min(1, { message: 'Please give a name.' }).max(120),
    isAdmin: z.boolean().default(false),
    password: z
      .string()
      .min(10, { message: 'Use at least 10 characters for a password.' })
      .max(200)
      .optional(),
  })
  .strict();

/** Body of `PATCH /api/admin/users/:id`. */
export const updateUserBodySchema = z
  .object({
    name: z.string().trim().min(1).max(120),
    isAdmin: z.boolean(),
    disabled: z.boolean(),
  })
  .partial()
  .strict()
  .refine(hasSomeField, { message: 'Send at least one field to change.' });

/** A user as the admin pages list them. */
export interface AdminUserView {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
  disabled: boolean;
  createdAt: string;
  lastLoginAt: string | null;
  memberships: { projectSlug: string; role: string }[];
}

/** A message caught by the local mail fake. */
export interface OutboxMessage {
  id: string;
  to: string;
  from: string;
  subject: string;
  text: string;
  html: string | null;
  receivedAt: string;
}
