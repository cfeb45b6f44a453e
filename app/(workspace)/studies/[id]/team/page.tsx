import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { TeamPage } from '@/components/team/team-page';
import { getPageUser } from '@/lib/server/auth/session';
import { mailboxDir } from '@/lib/server/mail/mailbox';

export const metadata: Metadata = { title: 'Team' };

export default async function StudyTeamPage() {
  const user = await getPageUser();
  if (!user) redirect('/sign-in');
  return <TeamPage currentUserId={user.id} mailboxEnabled={mailboxDir() !== null} />;
}
