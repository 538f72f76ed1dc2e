import type { ProjectRole } from '../../../api/features/projects/schemas';

export const roleOptions: { value: ProjectRole; label: string }[] = [
  { value: 'owner', label: 'Owner' },
  { value: 'editor', label: 'Editor' },
  { value: 'viewer', label: 'Viewer' },
];

export const roleMeaning: Record<ProjectRole, string> = {
  owner: 'everything, including members and deleting the project',
  editor: 'creates and changes campaigns and measurements',
  viewer: 'reads and downloads',
};

const style: Record<ProjectRole, string> = {
  owner: 'border-fjord-700 bg-fjord-50 text-fjord-800',
  editor: 'border-slate-400 bg-slate-50 text-ink-800',
  viewer: 'border-slate-300 bg-white text-ink-600',
};
const mark: Record<ProjectRole, string> = { owner: '◆', editor: '◇', viewer: '○' };

/** The role as a word with a shape, never colour alone. */
export function RoleBadge({ role }: { role: ProjectRole }) {
  return (
    <span
      className={`inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-medium ${style[role]}`}
      title={roleMeaning[role]}
    >
      <span aria-hidden="true">{mark[role]}</span>
      {role}
    </span>
  );
}
