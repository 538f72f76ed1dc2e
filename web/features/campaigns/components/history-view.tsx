import { recordLinks, useHistoryEntries } from '../api/records';
import { HistoryList } from './campaign-records';

/** A project's history (owners only) as sentences, newest first, with a CSV export. */
export function HistoryView({ projectId }: { projectId: string }) {
  const history = useHistoryEntries({ projectId });
  return <HistoryList history={history} csvHref={recordLinks.projectHistoryCsv(projectId)} empty="Nothing has been recorded yet." />;
}
