import { Link, useNavigate } from 'react-router-dom';
import { Button } from '../../../components/ui/form';
import { Panel } from '../../../components/ui/page';
import { paths } from '../../../config/paths';
import { ApiError } from '../../../lib/api-client';
import { useSignOut } from '../../../lib/sign-out';
import { RoleBadge, roleMeaning } from '../../../components/ui/role-badge';
import { useAcceptInvitation, useInvitation } from '../api/invitation';

const headings: Record<string, string> = {
  'invitation-expired': 'This invitation has expired',
  'invitation-used': 'This invitation has already been used',
  'invitation-revoked': 'This invitation was withdrawn',
  'invitation-wrong-account': 'This invitation is for another account',
};

function Problem({ error, token }: { error: Error; token: string }) {
  const signOut = useSignOut();
  const navigate = useNavigate();
  const code = error instanceof ApiError ? String(error.problem.code ?? '') : '';
  const heading =
    headings[code] ??
    (error instanceof ApiError && error.status === 404 ? 'This invitation link is not valid' : 'The invitation could not be opened');
  return (
    <div role="alert">
      <h2 className="text-lg font-semibold text-ink-950">{heading}</h2>
      <p className="mt-1 text-sm text-ink-700">{error.message}</p>
      {code === 'invitation-wrong-account' && (
        <Button
          className="mt-3"
          onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate(paths.signIn.getHref(paths.invitation.getHref(token))) })}
        >
          Sign out and sign in with the invited account
        </Button>
      )}
    </div>
  );
}

export function InvitationCard({ token }: { token: string }) {
  const invitation = useInvitation(token, true);
  const accept = useAcceptInvitation(token);
  const navigate = useNavigate();
  if (invitation.isPending)
    return (
      <Panel>
        <p className="text-sm text-ink-500">Checking the invitation…</p>
      </Panel>
    );
  if (invitation.isError)
    return (
      <Panel>
        <Problem error={invitation.error} token={token} />
      </Panel>
    );
  const i = invitation.data;
  return (
    <Panel>
      <h2 className="text-lg font-semibold text-ink-950">Join “{i.projectName}”</h2>
      <p className="mt-1 text-sm text-ink-700">
        {i.invitedBy ? `${i.invitedBy.displayName ?? i.invitedBy.login} invited` : 'You were invited as'}{' '}
        <span className="font-mono">{i.email}</span> to join as <RoleBadge role={i.role} /> ({roleMeaning[i.role]}).
      </p>
      {accept.isError ? (
        <div className="mt-3">
          <Problem error={accept.error} token={token} />
        </div>
      ) : (
        <div className="mt-4 flex gap-3">
          <Button
            variant="primary"
            disabled={accept.isPending}
            onClick={() => accept.mutate(undefined, { onSuccess: (r) => navigate(paths.project.getHref(r.projectId)) })}
          >
            Accept and join
          </Button>
          <Link className="self-center text-sm text-fjord-700 underline" to={paths.projects.getHref()}>
            Not now
          </Link>
        </div>
      )}
    </Panel>
  );
}
