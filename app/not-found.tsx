import Link from 'next/link';
import { Wordmark } from '@/components/layout/logo';

export default function NotFound() {
  return (
    <main className="mx-auto max-w-md space-y-4 px-6 py-24 text-center">
      <Wordmark />
      <h1>Nothing here</h1>
      <p className="text-ink-soft">This page does not exist, or you are not a member of the study it belongs to.</p>
      <Link href="/studies" className="text-teal-700 underline">
        Back to your studies
      </Link>
    </main>
  );
}
