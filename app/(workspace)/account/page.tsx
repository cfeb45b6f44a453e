import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { AddressUnconfirmed } from '@/components/account/address-confirmation';
import { ChangePasswordForm } from '@/components/team/change-password-form';
import { NoticeSettingsForm } from '@/components/team/notice-settings-form';
import { getPageUser } from '@/lib/server/auth/session';
import { mailboxDir } from '@/lib/server/mail/mailbox';

export const metadata: Metadata = { title: 'Account' };

export default async function AccountPage() {
  const user = await getPageUser();
  if (!user) redirect('/sign-in');
  return (
    <div className="max-w-2xl space-y-6">
      <div>
        <h1>Your account</h1>
        <p className="mt-1 text-sm text-ink-soft">
          Signed in as {user.name} ({user.email}
          {user.emailVerified ? ', confirmed' : ''}).
        </p>
      </div>
      {user.emailVerified ? null : <AddressUnconfirmed email={user.email} blocks="invitations to studies cannot be accepted with it" mailbox={mailboxDir() !== null} />}
      <NoticeSettingsForm email={user.email} />
      <ChangePasswordForm />
    </div>
  );
}
