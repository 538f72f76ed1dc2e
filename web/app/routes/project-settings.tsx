import { useParams } from 'react-router-dom';
import { Page } from '../../components/ui/page';
import { paths } from '../../config/paths';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { useProject } from '../../features/projects/api/projects';
import { UnreadyProjectPage } from '../../features/projects/components/unready-project-page';
import { ProjectSettings } from '../../features/projects/components/project-settings';

function Settings({ projectId, myId }: { projectId: string; myId: string }) {
  const project = useProject(projectId);
  if (!project.isSuccess) return <UnreadyProjectPage query={project} title="Project settings" />;
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
