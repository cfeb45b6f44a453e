'use client';

import { Card } from '@/components/ui/card';
import { useStudyContext } from '@/components/studies/study-context';
import { NewRunForm } from './new-run-form';
import { PowerCaution } from './power-caution';
import { RunList } from './run-list';

/** The power section: saved runs for everyone; a new-run form for editors. */
export function PowerPage() {
  const { can } = useStudyContext();
  return (
    <div className="space-y-6">
      <Card title="Power runs">
        <RunList />
      </Card>
      {can('editor') ? (
        <Card title="New power simulation">
          <NewRunForm />
        </Card>
      ) : null}
      <PowerCaution />
    </div>
  );
}
