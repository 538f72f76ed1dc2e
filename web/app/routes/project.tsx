import { Link, useParams } from 'react-router-dom';
import { Page } from '../../components/ui/page';
import { paths } from '../../config/paths';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { ProjectCampaigns } from '../../features/campaigns/components/project-campaigns';
import { useProject } from '../../features/projects/api/projects';
import { UnreadyProjectPage } from '../../features/projects/components/unready-project-page';
import { RoleBadge } from '../../components/ui/role-badge';

function ProjectPage({ projectId }: { projectId: string }) {
  const project = useProject(projectId);
  if (!project.isSuccess) return <UnreadyProjectPage query={project} title="Project" />;
  const p = project.data;
  return (
    <Page
      title={p.name}
      crumbs={[{ label: 'Projects', to: paths.projects.getHref() }, { label: p.name }]}
      lead={p.description || undefined}
      actions={
        <div className="flex items-center gap-3 text-sm">
          <span>
            Your role: <RoleBadge role={p.role} />
          </span>
          <Link className="text-fjord-700 underline" to={paths.projectSettings.getHref(p.id)}>
            Members &amp; settings
          </Link>
          {p.role === 'owner' && (
            <Link className="text-fjord-700 underline" to={paths.projectHistory.getHref(p.id)}>
              History
            </Link>
          )}
        </div>
      }
    >
      <ProjectCampaigns projectId={p.id} canEdit={p.role !== 'viewer'} />
    </Page>
  );
}

export function ProjectRoute() {
  const { projectId = '' } = useParams();
  return <SignedInOnly title="Project">{() => <ProjectPage projectId={projectId} />}</SignedInOnly>;
}
