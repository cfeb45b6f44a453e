import { Suspense } from 'react';
import { CompareView } from '@/components/power/compare-view';

export default function PowerComparePage() {
  return (
    <Suspense fallback={<p className="text-sm text-ink-soft">Loading…</p>}>
      <CompareView />
    </Suspense>
  );
}
