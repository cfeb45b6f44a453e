'use client';

import { useSyncExternalStore } from 'react';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useStudyContext } from '@/components/studies/study-context';
import { downloadStarter, useApiKeys, useFrozenVersions } from '@/lib/client/item-bank';
import { Button } from '@/components/ui/button';
import { ApiDocs } from './api-docs';
import { ApiKeyForm } from './api-key-form';
import { ApiKeysTable } from './api-keys-table';

const subscribe = () => () => {};

/** API keys (create, list, revoke) and the probe-items API's documentation. */
export function ApiPage() {
  const { study, can } = useStudyContext();
  const origin = useSyncExternalStore(subscribe, () => window.location.origin, () => 'http://127.0.0.1:3000');
  const allowed = can('operator');
  return (
    <div className="space-y-6">
      {allowed ? <KeysSection studyId={study.id} /> : <Notice tone="warning" title="Operators and above">Managing API keys needs the operator role or higher.</Notice>}
      <Card title="Probe-items API">
        <ApiDocs studyId={study.id} origin={origin} />
      </Card>
    </div>
  );
}

function KeysSection({ studyId }: { studyId: number }) {
  const versions = useFrozenVersions(studyId);
  const keys = useApiKeys(studyId);
  return (
    <Card title="API keys">
      <div className="space-y-6">
        <QueryState query={versions} label="Loading frozen versions…">
          {versions.data?.length ? (
            <ApiKeyForm studyId={studyId} versions={versions.data} />
          ) : (
            <Notice title="No frozen design yet">A key serves one frozen design version; freeze a design first.</Notice>
          )}
        </QueryState>
        <QueryState query={keys} label="Loading keys…">
          <ApiKeysTable studyId={studyId} keys={keys.data ?? []} />
        </QueryState>
        {versions.data?.length ? (
          <div className="space-y-2 text-sm">
            <p>
              <strong>Starter experiment</strong>: a static page (HTML and plain JavaScript) that runs the whole two-stage session with a browser key from your own site.
              Create a browser key above to download it with the key written in, or download it here and paste a browser key into its settings.
            </p>
            <div className="flex flex-wrap gap-2">
              {versions.data.map((v) => (
                <Button key={v.id} size="sm" variant="secondary" onClick={() => downloadStarter(studyId, v.id)}>
                  Starter for {v.designName} v{v.number}
                </Button>
              ))}
            </div>
          </div>
        ) : null}
      </div>
    </Card>
  );
}
