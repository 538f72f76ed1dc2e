import { Link } from 'react-router-dom';
import { paths } from '../../../config/paths';
import { useProjects } from '../api/projects';
import { RoleBadge } from '../../../components/ui/role-badge';
import { ListHead } from '../../../components/ui/table-head';

const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium' });

export function ProjectsList() {
  const projects = useProjects();
  if (projects.isPending) return <p className="text-sm text-ink-500">Loading projects…</p>;
  if (projects.isError)
    return (
      <p role="alert" className="text-sm text-rose-700">
        {projects.error.message}
      </p>
    );
  if (!projects.data.length) {
    return <p className="text-sm text-ink-600">You are not in any project yet. Create one, or ask an owner to invite you.</p>;
  }
  return (
    <table className="w-full text-left text-sm">
      <caption className="sr-only">Your projects</caption>
      <ListHead
        columns={[
          { label: 'Project' },
          { label: 'Your role' },
          { label: 'Members', align: 'right' },
          { label: 'Changed' },
          { label: 'Links', hidden: true },
        ]}
      />
      <tbody>
        {projects.data.map((p) => (
          <tr key={p.id} className="border-b border-slate-100 align-top">
            <td className="py-2.5 pr-3">
              <Link className="font-medium text-fjord-700 underline" to={paths.project.getHref(p.id)}>
                {p.name}
              </Link>
              {p.description && <p className="mt-0.5 line-clamp-2 max-w-xl text-xs text-ink-600">{p.description}</p>}
            </td>
            <td className="py-2.5 pr-3">
              <RoleBadge role={p.role} />
            </td>
            <td className="tnum py-2.5 pr-3 text-right">{p.memberCount}</td>
            <td className="tnum py-2.5 pr-3 text-ink-600">{dateFormat.format(new Date(p.updatedAt))}</td>
            <td className="py-2.5 text-right whitespace-nowrap">
              <Link
                className="text-fjord-700 underline"
                to={paths.projectSettings.getHref(p.id)}
                aria-label={`Members & settings of ${p.name}`}
              >
                Members &amp; settings
              </Link>
              {p.role === 'owner' && (
                <Link className="ml-3 text-fjord-700 underline" to={paths.projectHistory.getHref(p.id)} aria-label={`History of ${p.name}`}>
                  History
                </Link>
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
