import { Page } from '../../components/ui/page';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { TokenManager } from '../../features/tokens/components/token-manager';

export function TokensRoute() {
  return (
    <SignedInOnly title="API tokens">
      {() => (
        <Page
          title="API tokens"
          lead="Personal tokens let scripts call Eyrie's API as you. A token carries your roles and nothing more; revoke it when it is no longer needed."
        >
          <TokenManager />
        </Page>
      )}
    </SignedInOnly>
  );
}
