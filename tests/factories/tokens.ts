import type { Knex } from 'knex';
import { createToken, revokeToken } from '../../api/features/tokens/service';
import type { User } from '../../api/models/user';
import { testKnex } from '../support/db';

export async function createApiToken(
  user: User,
  overrides: Partial<{ name: string; expiresInDays: number; revoked: boolean }> = {},
  db: Knex = testKnex(),
) {
  const made = await createToken(db, user.id, { name: overrides.name ?? 'test token', expiresInDays: overrides.expiresInDays ?? 30 });
  if (overrides.revoked) await revokeToken(db, user.id, made.token.id);
  return made;
}
