import { Link, useParams } from 'react-router-dom';
import { Page, Panel, UnreadyPage } from '../../components/ui/page';
import { paths } from '../../config/paths';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { useProject } from '../../features/projects/api/projects';
import { HistoryView } from '../../features/campaigns/components/history-view';

function History({ projectId }: { projectId: string }) {
  const project = useProject(projectId);
  if (!project.isSuccess) return <UnreadyPage query={project} title="History" missingTitle="Project not found" />;
  if (project.data.role !== 'owner') {
    return (
      <Page title={`History of ${project.data.name}`}>
        <Panel>
          <p className="text-sm text-ink-700">Only owners can read a project’s history.</p>
        </Panel>
      </Page>
    );
  }
  return (
    <Page
      title={`History of ${project.data.name}`}
      crumbs={[
        { label: 'Projects', to: paths.projects.getHref() },
        { label: project.data.name, to: paths.project.getHref(projectId) },
        { label: 'History' },
      ]}
      lead="Every change to this project’s data: who made it, when, what changed from what to what, and why."
      actions={
        <Link className="text-sm text-fjord-700 underline" to={paths.projectSettings.getHref(projectId)}>
          Members &amp; settings
        </Link>
      }
    >
      <Panel>
        <HistoryView projectId={projectId} />
      </Panel>
    </Page>
  );
}

export function ProjectHistoryRoute() {
  const { projectId = '' } = useParams();
  return <SignedInOnly title="History">{() => <History projectId={projectId} />}</SignedInOnly>;
}
