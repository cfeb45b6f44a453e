'use client';

import Link from 'next/link';
import { Button, buttonClass } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { useConfirmAddress } from '@/lib/client/account';

/**
 * The confirmation link's page: a button confirms (opening the link alone does not, since mail
 * scanners open links too), then the page says so.
 */
export function ConfirmAddress({ token, problem, signedIn }: { token: string; problem: string | null; signedIn: boolean }) {
  const confirm = useConfirmAddress();
  const next = (
    <Link href={signedIn ? '/studies' : '/sign-in'} className={buttonClass('secondary')}>
      {signedIn ? 'Go to your studies' : 'Sign in'}
    </Link>
  );
  if (problem) {
    return (
      <div className="space-y-4">
        <h1 className="text-xl">This link cannot be used</h1>
        <Notice tone="warning">{problem}</Notice>
        {next}
      </div>
    );
  }
  if (confirm.isSuccess) {
    return (
      <div className="space-y-4">
        <h1 className="text-xl">Address confirmed</h1>
        <Notice>{confirm.data.message} Invitations sent to it can now be accepted.</Notice>
        {next}
      </div>
    );
  }
  return (
    <div className="space-y-4">
      <h1 className="text-xl">Confirm your e-mail address</h1>
      <p className="text-sm">Confirm that the address this link was sent to is yours.</p>
      {confirm.error ? <Notice tone="error">{confirm.error.message}</Notice> : null}
      <Button className="w-full" disabled={confirm.isPending} onClick={() => confirm.mutate(token)}>
        {confirm.isPending ? 'Confirming…' : 'Confirm my address'}
      </Button>
    </div>
  );
}
