'use client';

import { Button } from '@/components/ui/button';
import { Table, Td, Th } from '@/components/ui/table';
import { useFrozenVersions, useRevokeApiKey, type ApiKeyDto } from '@/lib/client/item-bank';
import { formatDateTime } from '@/lib/shared/format';

/** The study's keys with prefix, creator and last use; active keys can be revoked. */
export function ApiKeysTable({ studyId, keys }: { studyId: number; keys: ApiKeyDto[] }) {
  const revoke = useRevokeApiKey(studyId);
  // the design's name and version number instead of the version's database id
  const versions = useFrozenVersions(studyId);
  const versionName = (id: number) => {
    const v = versions.data?.find((x) => x.id === id);
    return v ? `${v.designName}, version ${v.number}` : 'a frozen version';
  };
  if (keys.length === 0) return <p className="text-sm text-ink-soft">No keys yet.</p>;
  return (
    <Table caption="API keys">
      <thead className="bg-paper-sunk">
        <tr>
          <Th>Name</Th>
          <Th>Prefix</Th>
          <Th>Kind and origins</Th>
          <Th>Version and items</Th>
          <Th>Created by</Th>
          <Th>Last used</Th>
          <Th>Status</Th>
        </tr>
      </thead>
      <tbody className="divide-y divide-ink/10">
        {keys.map((k) => (
          <tr key={k.id} data-testid="api-key-row">
            <Td>{k.name}</Td>
            <Td className="font-mono text-xs">{k.prefix}…</Td>
            <Td>
              {k.kind === 'browser' ? 'browser' : 'server'}
              <span className="block text-xs text-ink-soft">{k.allowedOrigins.length ? k.allowedOrigins.join(', ') : 'no browser origins'}</span>
            </Td>
            <Td>
              <span data-testid="api-key-version">{versionName(k.designVersionId)}</span>
              {k.presentation ? (
                <span className="block text-xs text-ink-soft">
                  {k.presentation.delayUnit}, gap {k.presentation.minGap}, seed {k.presentation.seed} · item bank <span className="font-mono">{k.itemBankId}</span>
                </span>
              ) : null}
            </Td>
            <Td>
              {k.createdBy ?? '—'}
              <span className="block text-xs text-ink-soft">{formatDateTime(k.createdAt)}</span>
            </Td>
            <Td>{k.lastUsedAt ? formatDateTime(k.lastUsedAt) : 'never'}</Td>
            <Td>
              {k.revokedAt ? (
                <span className="text-ink-soft">revoked {formatDateTime(k.revokedAt)}</span>
              ) : (
                <Button
                  variant="danger"
                  size="sm"
                  disabled={revoke.isPending}
                  onClick={() => {
                    if (window.confirm(`Revoke "${k.name}"? Software using it stops getting items at once.`)) revoke.mutate(k.id);
                  }}
                >
                  Revoke
                </Button>
              )}
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
