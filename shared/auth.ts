import { z } from 'zod';
import type { ProjectRole } from './roles';

const email = z
  .string({ message: 'E-mail is required.' })
  .trim()
  .toLowerCase()
  .max(254)
  .email({ message: 'This is not a valid e-mail address.' });

/** Passwords: at least 10 characters; long passphrases welcome. */
export const passwordSchema = z
  .string({ message: 'A password is required.' })
  .min(10, { message: 'Use at least 10 characters for a password.' })
  .max(200, { message: 'Use at most 200 characters for a password.' });

export const loginBodySchema = z
  .object({ email, password: z.string({ message: 'A password is required.' }).min(1).max(200) })
  .strict();

export const changePasswordBodySchema = z
  .object({ currentPassword: z.string().min(1).max(200), newPassword: passwordSchema })
  .strict();

export const resetRequestBodySchema = z.object({ email }).strict();

export const resetConfirmBodySchema = z
  .object({ token: z.string().min(20).max(200), newPassword: passwordSchema })
  .strict();

export const acceptInvitationBodySchema = z
  .object({
    name: z.string().trim().min(1, { message: 'Please give your name.' }).max(120),
    password: z.string().min(1).max(200),
  })
  .strict();

export const emailSchema = email;

/** The signed-in user as the API shows them. */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
}

/** One membership of the signed-in user. */
export interface MembershipSummary {
  projectSlug: string;
  role: ProjectRole;
}

/** Answer of sign-in and of `GET /api/auth/me`. */
export interface MeResponse {
  user: SessionUser;
  memberships: MembershipSummary[];
}

/** What an invitation link shows before it is accepted. */
export interface InvitationPreview {
  email: string;
  projectSlug: string;
  projectName: string;
  role: ProjectRole;
  expiresAt: string;
  accountExists: boolean;
}
