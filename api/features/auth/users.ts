import type { Knex } from 'knex';
import { User } from '../../models/user';

export interface UserView {
  id: string;
  login: string;
  displayName: string | null;
  email: string | null;
  avatarUrl: string | null;
}

export const toUserView = (u: User): UserView => ({
  id: u.id,
  login: u.login,
  displayName: u.displayName,
  email: u.email,
  avatarUrl: u.avatarUrl,
});

/** Create or refresh the Eyrie user behind a provider identity; details follow the provider on each sign-in. */
export async function upsertProviderUser(
  db: Knex,
  input: {
    provider: string;
    providerUserId: string;
    login: string;
    displayName: string | null;
    email: string | null;
    avatarUrl: string | null;
  },
): Promise<User> {
  const [row] = await db('users')
    .insert({ ...input, email: input.email?.toLowerCase() ?? null })
    .onConflict(['provider', 'provider_user_id'])
    .merge(['login', 'display_name', 'email', 'avatar_url', 'updated_at'])
    .returning('id');
  return User.query(db).findById(row.id).throwIfNotFound();
}
