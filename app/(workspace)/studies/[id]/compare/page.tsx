import { ComparePage } from '@/components/planner/compare-page';
import { parseRouteId } from '@/lib/server/route-ids';

/** `?designs=3,5,8`: the designs to compare, in order (at most four). */
export default async function StudyComparePage({ searchParams }: { searchParams: Promise<{ designs?: string }> }) {
  const { designs } = await searchParams;
  const ids = [...new Set((designs ?? '').split(',').map(parseRouteId).filter((id): id is number => id !== null))].slice(0, 4);
  return <ComparePage ids={ids} />;
}
