import { useParams } from 'react-router-dom';
import { Page } from '../../components/ui/page';
import { paths } from '../../config/paths';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { useProject } from '../../features/projects/api/projects';
import { ProjectSettings } from '../../features/projects/components/project-settings';

function Settings({ projectId, myId }: { projectId: string; myId: string }) {
  const project = useProject(projectId);
  if (project.isPending)
    return (
      <Page title="Project settings">
        <p className="text-sm text-ink-500">Loading…</p>
      </Page>
    );
  if (project.isError) {
    return (
      <Page title="Project not found" lead={project.error.message}>
        <p className="text-sm text-ink-600">Either it does not exist or you are not a member of it.</p>
      </Page>
    );
  }
  return (
    <Page
      title={project.data.name}
      crumbs={[
        { label: 'Projects', to: paths.projects.getHref() },
        { label: project.data.name, to: paths.project.getHref(projectId) },
        { label: 'Members & settings' },
      ]}
      lead="Members, invitations and settings of this project."
    >
      <ProjectSettings project={project.data} myId={myId} />
    </Page>
  );
}

export function ProjectSettingsRoute() {
  const { projectId = '' } = useParams();
  return <SignedInOnly title="Project settings">{(user) => <Settings projectId={projectId} myId={user.id} />}</SignedInOnly>;
}
