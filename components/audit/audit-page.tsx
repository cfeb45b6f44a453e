'use client';

import { Notice } from '@/components/ui/notice';
import { useStudyContext } from '@/components/studies/study-context';
import { AuditTable } from './audit-table';

/** The audit section: owners and editors see the trail; others are told why they do not. */
export function AuditPage() {
  const { can } = useStudyContext();
  if (!can('editor')) {
    return <Notice title="Owners and editors only">The audit trail of this study is visible to its owners and editors.</Notice>;
  }
  return <AuditTable />;
}
