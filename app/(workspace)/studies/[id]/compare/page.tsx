import { ComparePage } from '@/components/planner/compare-page';

/** `?designs=3,5,8`: the designs to compare, in order (at most four). */
export default async function StudyComparePage({ searchParams }: { searchParams: Promise<{ designs?: string }> }) {
  const { designs } = await searchParams;
  const ids = [...new Set((designs ?? '').split(',').filter((s) => /^\d{1,10}$/.test(s)).map(Number))].slice(0, 4);
  return <ComparePage ids={ids} />;
}
