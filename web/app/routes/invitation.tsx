import { useParams } from 'react-router-dom';
import { Page } from '../../components/ui/page';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { InvitationCard } from '../../features/invitations/components/invitation-card';

export function InvitationRoute() {
  const { token = '' } = useParams();
  return (
    <SignedInOnly title="Invitation">
      {() => (
        <Page title="Invitation" lead="Accepting adds you to the project with the role the owner chose.">
          <div className="max-w-2xl">
            <InvitationCard token={token} />
          </div>
        </Page>
      )}
    </SignedInOnly>
  );
}
