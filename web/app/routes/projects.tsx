import { Page, Panel } from '../../components/ui/page';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { CreateProjectForm } from '../../features/projects/components/create-project-form';
import { ProjectsList } from '../../features/projects/components/projects-list';

export function ProjectsRoute() {
  return (
    <SignedInOnly title="Projects">
      {() => (
        <Page title="Projects" lead="The projects you belong to. Only members see a project; your role decides what you can change.">
          <div className="grid gap-4 lg:grid-cols-[1fr_320px]">
            <Panel title="Your projects">
              <ProjectsList />
            </Panel>
            <Panel title="New project">
              <CreateProjectForm />
            </Panel>
          </div>
        </Page>
      )}
    </SignedInOnly>
  );
}
