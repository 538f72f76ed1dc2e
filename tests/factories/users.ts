import { randomBytes } from 'node:crypto';
import { testKnex } from '../support/db';
import { fakeProviderUserId } from '../../api/features/auth/fake-provider';
import { User } from '../../api/models/user';

export interface TestIdentity {
  login: string;
  name: string;
  email: string;
}

/** A unique identity, as typed on the local sign-in page. */
export function newIdentity(overrides: Partial<TestIdentity> = {}): TestIdentity {
  const login = overrides.login ?? `t-${randomBytes(5).toString('hex')}`;
  return { login, name: overrides.name ?? `Test ${login}`, email: overrides.email ?? `${login}@example.test` };
}

/** A user row that the fake provider's identity with the same login signs in as. */
export async function createUser(overrides: Partial<TestIdentity> = {}): Promise<User> {
  const who = newIdentity(overrides);
  return User.query(testKnex()).insertAndFetch({
    provider: 'local-demo',
    providerUserId: fakeProviderUserId(who.login),
    login: who.login,
    displayName: who.name,
    email: who.email.toLowerCase(),
  });
}
