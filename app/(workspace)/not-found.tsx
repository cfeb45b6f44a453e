import Link from 'next/link';
import { Notice } from '@/components/ui/notice';

export default function WorkspaceNotFound() {
  return (
    <div className="mx-auto max-w-xl">
      <Notice tone="error" title="Not found">
        This page does not exist, or you are not a member of the study it belongs to.{' '}
        <Link href="/studies" className="underline">
          Back to your studies
        </Link>
      </Notice>
    </div>
  );
}
