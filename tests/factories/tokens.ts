import { createToken, revokeToken } from '../../api/features/tokens/service';
import type { User } from '../../api/models/user';

export async function createApiToken(user: User, overrides: Partial<{ name: string; expiresInDays: number; revoked: boolean }> = {}) {
  const made = await createToken(user.id, { name: overrides.name ?? 'test token', expiresInDays: overrides.expiresInDays ?? 30 });
  if (overrides.revoked) await revokeToken(user.id, made.token.id);
  return made;
}
