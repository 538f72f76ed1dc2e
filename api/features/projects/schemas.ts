import { z } from 'zod';
import { projectRoles, type ProjectRole } from '../../models/enums';

/** Zod schemas shared by the API and the web forms. No server imports here. */
export { projectRoles, type ProjectRole };
export const projectRoleSchema = z.enum(projectRoles, { error: 'Choose owner, editor or viewer.' });

/** How much each role may do; a higher rank includes everything below it. */
export const roleRank: Record<ProjectRole, number> = { viewer: 1, editor: 2, owner: 3 };

const projectName = z
  .string({ error: 'Give the project a name.' })
  .trim()
  .min(1, 'Give the project a name.')
  .max(120, 'Keep the name to 120 characters or fewer.')
  .refine((s) => !s.includes('\u0000'), 'The name must not contain a NUL character (U+0000).');
const projectDescription = z
  .string({ error: 'The description must be text.' })
  .trim()
  .max(2000, 'Keep the description to 2000 characters or fewer.')
  .refine((s) => !s.includes('\u0000'), 'The description must not contain a NUL character (U+0000).');

export const projectFieldsSchema = z.object({ name: projectName, description: projectDescription.default('') });
export type ProjectFields = z.input<typeof projectFieldsSchema>;

// No defaults here: a field left out of a change stays as it is.
const projectDetailFields = { name: projectName.optional(), description: projectDescription.optional() };
const somethingToChange = [
  (v: { name?: string; description?: string }) => v.name !== undefined || v.description !== undefined,
  { message: 'Send a name or a description to change.' },
] as const;

/** The details form in the web app; the version it was loaded at is added when it is sent. */
export const projectDetailsSchema = z.object(projectDetailFields).refine(...somethingToChange);

/** A change names the version it was made from; a stale one is a 409 with `currentVersion`. */
export const projectPatchSchema = z
  .object({
    ...projectDetailFields,
    version: z
      .number({ error: 'Send the version of the project you last read.' })
      .int('version must be a whole number.')
      .min(1, 'version must be at least 1.'),
  })
  .refine(...somethingToChange);

export const invitationSchema = z.object({
  email: z
    .string({ error: 'Enter an e-mail address.' })
    .trim()
    .min(1, 'Enter an e-mail address.')
    .max(254, 'That address is too long.')
    .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.org.' })),
  role: projectRoleSchema,
});
export type InvitationFields = z.input<typeof invitationSchema>;

export const memberRoleSchema = z.object({ role: projectRoleSchema });

export const uuidSchema = z.uuid({ error: 'Not a valid id.' });
