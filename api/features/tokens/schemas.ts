import { z } from 'zod';

/** Zod schemas shared by the API and the web forms. */
export const TOKEN_MAX_DAYS = 365;

export const createTokenSchema = z.object({
  name: z
    .string({ error: 'Give the token a name.' })
    .trim()
    .min(1, 'Give the token a name, e.g. the script that will use it.')
    .max(80, 'Keep the name to 80 characters or fewer.'),
  expiresInDays: z.coerce
    .number({ error: 'Enter a number of days.' })
    .int('Enter a whole number of days.')
    .min(1, 'A token must live at least 1 day.')
    .max(TOKEN_MAX_DAYS, `A token may live at most ${TOKEN_MAX_DAYS} days.`),
});
export type CreateTokenFields = z.input<typeof createTokenSchema>;
