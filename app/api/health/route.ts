import { NextResponse } from 'next/server';
import { db } from '@/db';
import { isDatabaseUnavailable } from '@/lib/server/http/db-errors';

export const dynamic = 'force-dynamic';

/** Liveness for the start and test scripts: 200 when the app and its database answer, else 503. */
export async function GET() {
  try {
    await db().query('SELECT 1');
    return NextResponse.json({ status: 'ok', database: 'up' });
  } catch (error) {
    if (!isDatabaseUnavailable(error)) console.error('[switchback] health check failed', error);
    return NextResponse.json({ status: 'degraded', error: 'database unavailable' }, { status: 503 });
  }
}
