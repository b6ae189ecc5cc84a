import { useParams } from 'react-router-dom';
import { RunDetailScreen } from '@/features/runs/components/run-detail-screen';
import NotFoundRoute from './not-found';

export default function RunDetailRoute() {
  const { id } = useParams();
  const runId = /^\d+$/.test(id ?? '') ? Number(id) : NaN;
  if (!Number.isSafeInteger(runId) || runId < 1) return <NotFoundRoute />;
  // keyed by id so going from one run to another starts with a clean screen (no stale tag link)
  return <RunDetailScreen key={runId} runId={runId} />;
}
