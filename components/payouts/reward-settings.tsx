'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ProblemNotice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useStudyContext } from '@/components/studies/study-context';
import { ApiClientError } from '@/lib/client/api';
import { useRewardSettings, useSaveRewardSettings, type RewardSettingsDto } from '@/lib/client/payouts';

const input = 'w-28 rounded-md border border-ink/20 bg-paper-raised px-2 py-1 text-sm';
const BLOCKS = { both: 'both blocks', calibration: 'calibration block', probe: 'probe block' } as const;

/** An amount box's text as the API takes it: a number, or null when empty. */
function amountOf(text: string): number | null {
  const t = text.trim();
  return t === '' ? null : Number(t);
}

function VersionSettings({ studyId, settings, canEdit }: { studyId: number; settings: RewardSettingsDto; canEdit: boolean }) {
  const save = useSaveRewardSettings(studyId);
  const [enabled, setEnabled] = useState(settings.enabled);
  const [blocks, setBlocks] = useState(settings.blocks);
  const [cap, setCap] = useState(settings.cap ?? '');
  const [threshold, setThreshold] = useState(settings.approvalThreshold ?? '');
  const label = `version ${settings.versionNumber} (${settings.designName})`;
  const error = save.error instanceof ApiClientError ? { message: save.error.message, issues: save.error.issues } : null;
  return (
    <li className="space-y-2 border-b border-ink/10 pb-3 last:border-0" data-testid={`reward-settings-${settings.designVersionId}`}>
      <p className="text-sm font-medium">
        Version {settings.versionNumber}: {settings.designName} <span className="text-ink-soft">· amounts in {settings.currency}</span>
      </p>
      <div className="flex flex-wrap items-end gap-4 text-sm">
        <label className="flex items-center gap-2">
          <input type="checkbox" checked={enabled} disabled={!canEdit} onChange={(e) => setEnabled(e.target.checked)} aria-label={`Real rewards for ${label}`} />
          Pay real rewards
        </label>
        <label>
          <span className="block text-xs font-medium text-ink-soft">Draw the paid choice from</span>
          <select className={input + ' w-44'} value={blocks} disabled={!canEdit} onChange={(e) => setBlocks(e.target.value as typeof blocks)}>
            {Object.entries(BLOCKS).map(([value, text]) => (
              <option key={value} value={value}>
                {text}
              </option>
            ))}
          </select>
        </label>
        <label>
          <span className="block text-xs font-medium text-ink-soft">Cap per participant ({settings.currency})</span>
          <input className={input} inputMode="decimal" value={cap} disabled={!canEdit} placeholder="none" onChange={(e) => setCap(e.target.value)} aria-label={`Cap per participant for ${label}`} />
        </label>
        <label>
          <span className="block text-xs font-medium text-ink-soft">Owner approves above ({settings.currency})</span>
          <input className={input} inputMode="decimal" value={threshold} disabled={!canEdit} placeholder="none" onChange={(e) => setThreshold(e.target.value)} aria-label={`Approval threshold for ${label}`} />
        </label>
        {canEdit ? (
          <Button size="sm" disabled={save.isPending} onClick={() => save.mutate({ versionId: settings.designVersionId, input: { enabled, blocks, cap: amountOf(cap), approvalThreshold: amountOf(threshold) } })}>
            {save.isPending ? 'Saving…' : 'Save'}
          </Button>
        ) : null}
        {save.isSuccess ? <span className="text-xs text-teal-700">Saved.</span> : null}
      </div>
      {error ? <ProblemNotice title="Not saved" problem={error} testId="reward-settings-issues" /> : null}
    </li>
  );
}

/** Per frozen version: real rewards on or off, the draw's blocks, the cap and the approval threshold (owners change them). */
export function RewardSettingsCard() {
  const { study, can } = useStudyContext();
  const query = useRewardSettings(study.id);
  return (
    <Card title="Real rewards">
      <QueryState query={query} label="Loading the reward settings…">
        <p className="mb-3 text-sm text-ink-soft">
          With real rewards on, one of each participant&apos;s choices is drawn at random when they complete (every calibration and probe item, attention checks excluded) and paid as they chose it: the chosen amount, on the
          day its delay falls. {can('owner') ? '' : 'Owners change these settings.'}
        </p>
        {query.data?.versions.length === 0 ? <p className="text-sm">Freeze a design first: real rewards are set per frozen version.</p> : null}
        <ul className="space-y-3">
          {query.data?.versions.map((v) => (
            <VersionSettings key={v.designVersionId} studyId={study.id} settings={v} canEdit={can('owner')} />
          ))}
        </ul>
      </QueryState>
    </Card>
  );
}
