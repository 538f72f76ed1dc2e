import { UserMenu } from '../features/auth/components/user-menu';

/** Sign-in slot in the header. */
export function SessionSlot() {
  return <UserMenu />;
}
