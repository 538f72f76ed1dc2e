import { randomBytes } from 'node:crypto';
import { testKnex } from '../support/db';
import type { ProjectRole } from '../../api/features/projects/schemas';
import { Project } from '../../api/models/project';
import { ProjectMember } from '../../api/models/project-member';
import type { User } from '../../api/models/user';

/** A project with the given members (roles as given); no audit rows, as if it predates the test. */
export async function createProject(
  members: { user: User; role: ProjectRole }[],
  overrides: Partial<{ name: string; description: string }> = {},
): Promise<Project> {
  const project = await Project.query(testKnex()).insertAndFetch({
    name: overrides.name ?? `Test project ${randomBytes(3).toString('hex')}`,
    description: overrides.description ?? 'Made by a test.',
    createdBy: members.find((m) => m.role === 'owner')?.user.id ?? null,
  });
  for (const m of members) await ProjectMember.query(testKnex()).insert({ projectId: project.id, userId: m.user.id, role: m.role });
  return project;
}

/** The cast of the role tests: owner, editor and viewer share one project; the outsider owns a project of their own. */
export async function createTeamProjects(users: {
  owner: User;
  editor: User;
  viewer: User;
  outsider: User;
}): Promise<{ project: Project; outsiderProject: Project }> {
  const project = await createProject([
    { user: users.owner, role: 'owner' },
    { user: users.editor, role: 'editor' },
    { user: users.viewer, role: 'viewer' },
  ]);
  const outsiderProject = await createProject([{ user: users.outsider, role: 'owner' }]);
  return { project, outsiderProject };
}
