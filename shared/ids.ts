import { z } from 'zod';

/** Opaque ids are 20 lowercase hex characters. */
export const idSchema = z
  .string()
  .regex(/^[0-9a-f]{20}$/, { message: 'This id is not valid: ids are 20 hexadecimal characters.' });

/** Project slugs: lowercase letters, digits and single hyphens, 3–50 characters. */
export const slugSchema = z.string().regex(/^[a-z0-9](?:[a-z0-9]|-(?=[a-z0-9])){2,49}$/, {
  message:
    'A project slug has 3–50 lowercase letters, digits or single hyphens, and starts and ends with a letter or digit.',
});

/** Keyset pagination query: `?after=<cursor>&limit=`. */
export const pageQuerySchema = z
  .object({
    after: z.string().max(200).optional(),
    limit: z.coerce.number().int().min(1).max(500).default(50),
  })
  .strict();
