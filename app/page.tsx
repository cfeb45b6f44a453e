import { redirect } from 'next/navigation';
import { getPageUser } from '@/lib/server/auth/session';

export default async function Home() {
  redirect((await getPageUser()) ? '/studies' : '/sign-in');
}
