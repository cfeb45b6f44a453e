'use client';

import { useStudyContext } from '@/components/studies/study-context';
import { InvitationList } from './invitation-list';
import { InviteForm } from './invite-form';
import { MemberList } from './member-list';

/** The study's Team section: members for everyone, invitations for owners. */
export function TeamPage({ currentUserId, mailboxEnabled }: { currentUserId: number; mailboxEnabled: boolean }) {
  const { can } = useStudyContext();
  return (
    <div className="grid gap-6 lg:grid-cols-3">
      <div className="space-y-6 lg:col-span-2">
        <MemberList currentUserId={currentUserId} />
        {can('owner') ? <InvitationList /> : null}
      </div>
      {can('owner') ? (
        <div className="space-y-6">
          <InviteForm mailboxEnabled={mailboxEnabled} />
        </div>
      ) : null}
    </div>
  );
}
