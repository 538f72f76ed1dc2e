import type { Knex } from 'knex';
import { ApiToken } from '../../models/api-token';
import { User } from '../../models/user';
import { NotFoundError } from '../../lib/errors';
import { hashSecret, newSecret } from '../../lib/secrets';

export const TOKEN_PREFIX = 'eyr_';

export interface TokenView {
  id: string;
  name: string;
  prefix: string;
  createdAt: string;
  expiresAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
  status: 'active' | 'expired' | 'revoked';
}

export function toTokenView(t: ApiToken, now = new Date()): TokenView {
  const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
  return {
    id: t.id,
    name: t.name,
    prefix: t.prefix,
    createdAt: iso(t.createdAt)!,
    expiresAt: iso(t.expiresAt)!,
    lastUsedAt: iso(t.lastUsedAt),
    revokedAt: iso(t.revokedAt),
    status: t.revokedAt ? 'revoked' : new Date(t.expiresAt) <= now ? 'expired' : 'active',
  };
}

export async function listTokens(db: Knex, userId: string): Promise<TokenView[]> {
  const rows = await ApiToken.query(db).where({ userId }).orderBy('createdAt', 'desc');
  return rows.map((t) => toTokenView(t));
}

/** Create a token; the secret is returned this once and only its hash is kept. */
export async function createToken(
  db: Knex,
  userId: string,
  input: { name: string; expiresInDays: number },
): Promise<{ token: TokenView; secret: string }> {
  const secret = newSecret(TOKEN_PREFIX);
  const token = await ApiToken.query(db).insertAndFetch({
    userId,
    name: input.name,
    tokenHash: hashSecret(secret),
    prefix: secret.slice(0, TOKEN_PREFIX.length + 6),
    expiresAt: new Date(Date.now() + input.expiresInDays * 86_400_000),
  });
  return { token: toTokenView(token), secret };
}

export async function revokeToken(db: Knex, userId: string, tokenId: string): Promise<TokenView> {
  const token = await ApiToken.query(db).findOne({ id: tokenId, userId });
  if (!token) throw new NotFoundError('You have no token with this id.');
  if (!token.revokedAt) {
    token.revokedAt = new Date();
    await ApiToken.query(db).findById(token.id).patch({ revokedAt: token.revokedAt });
  }
  return toTokenView(token);
}

/** The owner of a live (unexpired, unrevoked) token, or null. Marks the token as used. */
export async function userForToken(db: Knex, secret: string): Promise<{ user: User; tokenId: string } | null> {
  if (!secret.startsWith(TOKEN_PREFIX)) return null;
  const token = await ApiToken.query(db)
    .findOne({ tokenHash: hashSecret(secret) })
    .whereNull('revokedAt')
    .where('expiresAt', '>', new Date());
  if (!token) return null;
  const user = await User.query(db).findById(token.userId);
  if (!user) return null;
  await ApiToken.query(db).findById(token.id).patch({ lastUsedAt: new Date() });
  return { user, tokenId: token.id };
}
