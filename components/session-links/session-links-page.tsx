'use client';

import Link from 'next/link';
import { useState } from 'react';
import { Button, buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useStudyContext } from '@/components/studies/study-context';
import { useFrozenVersions, type FrozenVersionDto } from '@/lib/client/item-bank';
import { useSessionLinks, useSetSessionLinkStatus, type SessionLinkDto } from '@/lib/client/session-page';
import { formatDateTime } from '@/lib/shared/format';
import { NewLinkForm } from './new-link-form';

const STATUSES = ['started', 'calibrated', 'served', 'completed', 'abandoned'] as const;

/** The study's participant links: create, pause, reopen, close, preview; sessions per status and failed attention checks. */
export function SessionLinksPage() {
  const { study } = useStudyContext();
  const links = useSessionLinks(study.id);
  const versions = useFrozenVersions(study.id);
  return (
    <div className="space-y-6">
      <Notice tone="warning" title="A study, not an assessment">
        The session page runs your frozen design as a study of choices. Estimates from it describe hypothetical choices and are not a clinical assessment of
        anyone. Paying real rewards, or any deception, must follow your ethics board&apos;s rules; write your consent text accordingly.
      </Notice>
      <Card title="New participant link">
        <QueryState query={versions} label="Loading versions…">
          {versions.data?.length ? <NewLinkForm studyId={study.id} versions={versions.data} /> : <p className="text-sm text-ink-soft">Freeze a design first: a link runs one frozen version.</p>}
        </QueryState>
      </Card>
      <QueryState query={links} label="Loading links…">
        {links.data?.length ? links.data.map((link) => <LinkCard key={link.id} studyId={study.id} link={link} version={versions.data?.find((v) => v.id === link.designVersionId)} />) : <p className="text-sm text-ink-soft">No participant links yet.</p>}
      </QueryState>
    </div>
  );
}

function LinkCard({ studyId, link, version }: { studyId: number; link: SessionLinkDto; version: FrozenVersionDto | undefined }) {
  const setStatus = useSetSessionLinkStatus(studyId);
  const [copied, setCopied] = useState(false);
  const url = `${typeof window === 'undefined' ? '' : window.location.origin}${link.path}?${link.participantParam}=PARTICIPANT_ID`;
  return (
    <Card title={link.name} actions={<span className="rounded bg-paper-sunk px-2 py-0.5 text-sm" data-testid="link-status">{link.status}</span>}>
      <div className="space-y-4" data-testid="session-link">
        <div className="space-y-1">
          <p className="text-sm text-ink-soft">Send participants this address, with each one&apos;s id in place of PARTICIPANT_ID:</p>
          <code className="block break-all rounded bg-paper-sunk px-2 py-1 font-mono text-xs" data-testid="link-url">
            {url}
          </code>
          <Button size="sm" variant="secondary" onClick={() => navigator.clipboard.writeText(url).then(() => setCopied(true), () => setCopied(false))}>
            {copied ? 'Copied' : 'Copy address'}
          </Button>
        </div>
        <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
          <dt className="text-ink-soft">Title</dt>
          <dd>{link.title}</dd>
          <dt className="text-ink-soft">Version</dt>
          <dd>{version ? `${version.designName} · v${version.number} · ${version.hash.slice(0, 12)}` : `#${link.designVersionId}`}</dd>
          <dt className="text-ink-soft">Completion code</dt>
          <dd className="font-mono">{link.completionCode}</dd>
          <dt className="text-ink-soft">Redirect</dt>
          <dd className="break-all">{link.redirectUrl ?? 'none'}</dd>
          <dt className="text-ink-soft">Created</dt>
          <dd>{formatDateTime(link.createdAt)}</dd>
        </dl>
        <p className="text-sm" data-testid="link-counts">
          Sessions: {STATUSES.map((s) => `${s} ${link.counts[s]}`).join(' · ')}
        </p>
        {link.attentionFailures.length ? (
          <Notice tone="warning" title={`Failed attention checks: ${link.attentionFailures.length}`}>
            <ul className="list-disc pl-5" data-testid="attention-failures">
              {link.attentionFailures.map((f) => (
                <li key={f.participantId}>
                  <span className="font-mono">{f.participantId}</span> — chose the dominated option in the {f.checks.join(' and ')} check
                </li>
              ))}
            </ul>
          </Notice>
        ) : (
          <p className="text-xs text-ink-soft">No failed attention checks. (Each block has one: the larger amount sooner against the smaller amount later; choosing the later one fails it. Checks are not analysed as choices.)</p>
        )}
        {setStatus.error ? <Notice tone="error">{setStatus.error.message}</Notice> : null}
        <div className="flex flex-wrap gap-2">
          <Link className={buttonClass('secondary', 'sm')} href={`/studies/${studyId}/session-links/${link.id}/preview`}>
            Preview
          </Link>
          {link.status === 'open' ? (
            <Button size="sm" variant="secondary" disabled={setStatus.isPending} onClick={() => setStatus.mutate({ linkId: link.id, status: 'paused' })}>
              Pause
            </Button>
          ) : null}
          {link.status === 'paused' ? (
            <Button size="sm" variant="secondary" disabled={setStatus.isPending} onClick={() => setStatus.mutate({ linkId: link.id, status: 'open' })}>
              Reopen
            </Button>
          ) : null}
          {link.status !== 'closed' ? (
            <Button
              size="sm"
              variant="danger"
              disabled={setStatus.isPending}
              onClick={() => {
                if (window.confirm('Close this link for good? Participants can no longer start or continue.')) setStatus.mutate({ linkId: link.id, status: 'closed' });
              }}
            >
              Close
            </Button>
          ) : null}
        </div>
      </div>
    </Card>
  );
}
