'use client';

import { useRouter } from 'next/navigation';
import { useStudyContext } from '@/components/studies/study-context';
import { Card } from '@/components/ui/card';
import { QueryState } from '@/components/ui/query-state';
import { useDesigns, usePriors } from '@/lib/client/planner';
import { CompareView } from './compare-view';
import { EstimateCaution } from './estimate-caution';

/** Compare two to four designs; the choice lives in the URL (?designs=3,5), so the page can be shared. */
export function ComparePage({ ids }: { ids: number[] }) {
  const { study } = useStudyContext();
  const router = useRouter();
  const designs = useDesigns(study.id);
  const priors = usePriors(study.id);
  const setIds = (next: number[]) => router.replace(`/studies/${study.id}/compare?designs=${next.join(',')}`);
  const chosen = (designs.data ?? []).filter((d) => ids.includes(d.id)).sort((a, b) => ids.indexOf(a.id) - ids.indexOf(b.id));
  return (
    <div className="space-y-6">
      <Card title="Designs to compare">
        <QueryState query={designs} label="Loading designs…">
          <div className="flex flex-wrap gap-4">
            {(designs.data ?? []).map((d) => (
              <label key={d.id} className="flex items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  checked={ids.includes(d.id)}
                  disabled={!ids.includes(d.id) && ids.length >= 4}
                  onChange={() => setIds(ids.includes(d.id) ? ids.filter((x) => x !== d.id) : [...ids, d.id])}
                />
                {d.name}
              </label>
            ))}
          </div>
          <p className="mt-2 text-xs text-ink-soft">Pick two to four. The address of this page keeps the choice: copy it to share the comparison.</p>
        </QueryState>
      </Card>
      <QueryState query={priors} label="Loading prior sets…">
        {chosen.length >= 2 && priors.data ? <CompareView designs={chosen} priors={priors.data} /> : <p className="text-sm text-ink-soft">Pick at least two designs.</p>}
      </QueryState>
      <EstimateCaution />
    </div>
  );
}
