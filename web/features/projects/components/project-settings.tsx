import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { invitationSchema, projectDetailsSchema, type InvitationFields, type ProjectRole } from '../../../../api/features/projects/schemas';
import { Button, FormAlert, SelectField } from '../../../components/ui/form';
import { FormFooter, FormSelectField, FormTextField } from '../../../components/ui/form-fields';
import { Panel } from '../../../components/ui/page';
import { paths } from '../../../config/paths';
import { applyServerErrors, submitThrough, useZodForm } from '../../../lib/form';
import { useCreateInvitation, useInvitations, useRevokeInvitation } from '../api/invitations';
import { useChangeMemberRole, useLeaveProject, useMembers, useRemoveMember } from '../../../lib/members';
import { useDeleteProject, useUpdateProject, type Project } from '../api/projects';
import { RoleBadge, roleMeaning, roleOptions } from '../../../components/ui/role-badge';
import { ListHead } from '../../../components/ui/table-head';

const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium' });

function DetailsForm({ project }: { project: Project }) {
  const form = useZodForm(projectDetailsSchema, { name: project.name, description: project.description });
  const update = useUpdateProject(project.id);
  return (
    <form
      noValidate
      aria-label="Project details"
      className="grid gap-3"
      // The version the page was loaded at: someone else's change in between is a 409, shown above the buttons.
      onSubmit={submitThrough(form, update, ['name', 'description'], { toBody: (input) => ({ ...input, version: project.version }) })}
    >
      <FormTextField control={form.control} name="name" label="Name" />
      <FormTextField control={form.control} name="description" label="Description" />
      <FormFooter control={form.control} pending={update.isPending} submit="Save details" className="flex items-center gap-3">
        {update.isSuccess && (
          <span role="status" className="text-sm text-fjord-700">
            ✓ Saved
          </span>
        )}
      </FormFooter>
    </form>
  );
}

function Members({ project, myId }: { project: Project; myId: string }) {
  const members = useMembers(project.id);
  const changeRole = useChangeMemberRole(project.id);
  const remove = useRemoveMember(project.id);
  const leave = useLeaveProject(project.id);
  const navigate = useNavigate();
  const [problem, setProblem] = useState<string | null>(null);
  const isOwner = project.role === 'owner';
  const onError = (e: Error) => setProblem(e.message);
  if (members.isPending) return <p className="text-sm text-ink-500">Loading members…</p>;
  if (members.isError)
    return (
      <p role="alert" className="text-sm text-rose-700">
        {members.error.message}
      </p>
    );
  return (
    <>
      <FormAlert>{problem}</FormAlert>
      <table className="mt-2 w-full text-left text-sm">
        <caption className="sr-only">Members of {project.name}</caption>
        <ListHead columns={[{ label: 'Person' }, { label: 'Role' }, { label: 'Since' }, { label: 'Actions', hidden: true }]} />
        <tbody>
          {members.data.members.map((m) => (
            <tr key={m.userId} className="border-b border-slate-100">
              <td className="py-2 pr-3">
                <span className="font-medium">{m.displayName ?? m.login}</span>
                {m.userId === myId && <span className="ml-1 text-xs text-ink-500">(you)</span>}
                <span className="block font-mono text-xs text-ink-500">
                  {m.login}
                  {m.email ? ` · ${m.email}` : ''}
                </span>
              </td>
              <td className="py-2 pr-3">
                {isOwner ? (
                  <SelectField
                    name={`role-${m.userId}`}
                    label={`Role of ${m.displayName ?? m.login}`}
                    hideLabel
                    className="w-32"
                    value={m.role}
                    options={roleOptions}
                    disabled={changeRole.isPending}
                    onChange={(role) => {
                      setProblem(null);
                      changeRole.mutate({ userId: m.userId, role }, { onError });
                    }}
                  />
                ) : (
                  <RoleBadge role={m.role} />
                )}
              </td>
              <td className="tnum py-2 pr-3 text-ink-600">{dateFormat.format(new Date(m.joinedAt))}</td>
              <td className="py-2 text-right">
                {m.userId === myId ? (
                  <Button
                    variant="danger"
                    onClick={() => {
                      setProblem(null);
                      if (window.confirm(`Leave “${project.name}”? You will lose access until someone invites you again.`)) {
                        leave.mutate(undefined, { onSuccess: () => navigate(paths.projects.getHref()), onError });
                      }
                    }}
                  >
                    Leave
                  </Button>
                ) : (
                  isOwner && (
                    <Button
                      variant="danger"
                      aria-label={`Remove ${m.displayName ?? m.login}`}
                      onClick={() => {
                        setProblem(null);
                        if (window.confirm(`Remove ${m.displayName ?? m.login} from “${project.name}”?`))
                          remove.mutate(m.userId, { onError });
                      }}
                    >
                      Remove
                    </Button>
                  )
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-3 text-xs text-ink-500">
        Owner: {roleMeaning.owner}. Editor: {roleMeaning.editor}. Viewer: {roleMeaning.viewer}. A project always keeps at least one owner.
      </p>
    </>
  );
}

function Invitations({ project }: { project: Project }) {
  const invitations = useInvitations(project.id, true);
  const create = useCreateInvitation(project.id);
  const revoke = useRevokeInvitation(project.id);
  const form = useZodForm(invitationSchema, { email: '', role: 'viewer' as ProjectRole });
  const [sentTo, setSentTo] = useState<string | null>(null);
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <form
        noValidate
        aria-label="Invite by e-mail"
        className="grid content-start gap-3"
        onSubmit={form.handleSubmit((input) => {
          setSentTo(null);
          create.mutate(input, {
            onSuccess: () => {
              setSentTo(input.email);
              form.reset();
            },
            onError: (e) => applyServerErrors(form.setError, e, ['email', 'role']),
          });
        })}
      >
        <FormTextField control={form.control} name="email" type="email" inputMode="email" label="E-mail address" />
        <FormSelectField<InvitationFields, ProjectRole> control={form.control} name="role" label="Role" options={roleOptions} />
        <FormFooter control={form.control} pending={create.isPending} submit="Send invitation" className="flex items-center gap-3">
          {sentTo && (
            <span role="status" className="text-sm text-fjord-700">
              ✓ Sent to {sentTo}
            </span>
          )}
        </FormFooter>
        <p className="text-xs text-ink-500">
          The e-mail holds a link that works once and expires after 7 days. Only someone signed in with that address can accept it.
        </p>
      </form>
      <div>
        <h3 className="text-sm font-semibold text-ink-800">Pending invitations</h3>
        {invitations.isPending ? (
          <p className="text-sm text-ink-500">Loading…</p>
        ) : invitations.isError ? (
          <p role="alert" className="text-sm text-rose-700">
            {invitations.error.message}
          </p>
        ) : invitations.data.length === 0 ? (
          <p className="mt-1 text-sm text-ink-600">None.</p>
        ) : (
          <ul className="mt-1 divide-y divide-slate-100 text-sm" aria-label="Pending invitations">
            {invitations.data.map((i) => (
              <li key={i.id} className="flex items-center justify-between gap-2 py-2">
                <span>
                  <span className="font-medium">{i.email}</span> <RoleBadge role={i.role} />
                  <span className="block text-xs text-ink-500">
                    {i.status === 'expired' ? '⌛ expired' : `expires ${dateFormat.format(new Date(i.expiresAt))}`}
                    {i.invitedBy ? ` · invited by ${i.invitedBy.displayName ?? i.invitedBy.login}` : ''}
                  </span>
                </span>
                <Button variant="plain" aria-label={`Withdraw the invitation to ${i.email}`} onClick={() => revoke.mutate(i.id)}>
                  Withdraw
                </Button>
              </li>
            ))}
          </ul>
        )}
      </div>
    </div>
  );
}

function DangerZone({ project }: { project: Project }) {
  const del = useDeleteProject(project.id);
  const navigate = useNavigate();
  return (
    <div className="flex flex-wrap items-center justify-between gap-3">
      <p className="text-sm text-ink-700">Deleting removes the project and everything in it for every member. Its history is kept.</p>
      <Button
        variant="danger"
        disabled={del.isPending}
        onClick={() => {
          if (window.confirm(`Delete “${project.name}” for every member? This cannot be undone.`))
            del.mutate(undefined, { onSuccess: () => navigate(paths.projects.getHref()) });
        }}
      >
        Delete project
      </Button>
      {del.isError && <FormAlert>{del.error.message}</FormAlert>}
    </div>
  );
}

export function ProjectSettings({ project, myId }: { project: Project; myId: string }) {
  const isOwner = project.role === 'owner';
  return (
    <div className="grid gap-4">
      <p className="text-sm text-ink-700">
        Your role here: <RoleBadge role={project.role} /> — {roleMeaning[project.role]}.
        {isOwner && (
          <>
            {' '}
            <Link className="text-fjord-700 underline" to={paths.projectHistory.getHref(project.id)}>
              See the project’s history
            </Link>
          </>
        )}
      </p>
      {isOwner && (
        <Panel title="Details">
          <DetailsForm project={project} />
        </Panel>
      )}
      <Panel title="Members">
        <Members project={project} myId={myId} />
      </Panel>
      {isOwner && (
        <Panel title="Invitations">
          <Invitations project={project} />
        </Panel>
      )}
      {isOwner && (
        <Panel title="Delete">
          <DangerZone project={project} />
        </Panel>
      )}
    </div>
  );
}
