'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import type { Role } from '@/lib/shared/roles';
import { roleAtLeast } from '@/lib/shared/roles';

/** The study's sections. A new feature page adds its entry here, with the least role that sees it. */
export const studySections: Array<{ segment: string; label: string; minRole: Role }> = [
  { segment: '', label: 'Overview', minRole: 'viewer' },
  { segment: 'priors', label: 'Priors', minRole: 'viewer' },
  { segment: 'designs', label: 'Designs', minRole: 'viewer' },
  { segment: 'compare', label: 'Compare', minRole: 'viewer' },
  { segment: 'power', label: 'Power', minRole: 'viewer' },
  { segment: 'item-bank', label: 'Item bank', minRole: 'operator' },
  { segment: 'api', label: 'API', minRole: 'viewer' },
  { segment: 'participants', label: 'Participants', minRole: 'viewer' },
  // Session page (issue 13): participant links, their status and a preview.
  { segment: 'session-links', label: 'Session links', minRole: 'operator' },
  // Results (issue 14): observed against expected patterns, tests, models, zone diagnosis.
  { segment: 'results', label: 'Results', minRole: 'viewer' },
  // Real rewards (issue 20): the reward settings per version and the payout ledger.
  { segment: 'payouts', label: 'Payouts', minRole: 'operator' },
  { segment: 'team', label: 'Team', minRole: 'viewer' },
  { segment: 'audit', label: 'Audit trail', minRole: 'editor' },
];

export function StudyNav({ studyId, role }: { studyId: number; role: Role }) {
  const pathname = usePathname();
  const base = `/studies/${studyId}`;
  return (
    <nav aria-label="Study sections" className="flex flex-wrap gap-1 border-b border-ink/10">
      {studySections
        .filter((s) => roleAtLeast(role, s.minRole))
        .map((s) => {
          const href = s.segment ? `${base}/${s.segment}` : base;
          const active = s.segment ? pathname === href || pathname.startsWith(`${href}/`) : pathname === base;
          return (
            <Link
              key={s.segment || 'overview'}
              href={href}
              aria-current={active ? 'page' : undefined}
              className={`-mb-px border-b-2 px-3 py-2 text-sm font-medium ${active ? 'border-teal-600 text-teal-700' : 'border-transparent text-ink-soft hover:text-ink'}`}
            >
              {s.label}
            </Link>
          );
        })}
    </nav>
  );
}
