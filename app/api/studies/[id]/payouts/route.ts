import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { ValidationError } from '@/lib/server/errors';
import { listPayouts, payoutsCsv } from '@/lib/server/services/payouts-ledger';
import { payoutsQuerySchema } from '@/lib/shared/validations/payouts';

/** The payout ledger (operators and above): ?status=, ?participant=, ?dueFrom=, ?dueTo= filter; ?format=csv exports. */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'operator');
  const parsed = payoutsQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new ValidationError(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(query)', message: i.message })));
  const { format, ...filter } = parsed.data;
  const ledger = await listPayouts(study.id, filter);
  if (format === 'csv') {
    return new Response(payoutsCsv(ledger.payouts), {
      headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="switchback-payouts-${study.id}.csv"`, 'Cache-Control': 'no-store' },
    });
  }
  return NextResponse.json(ledger);
});
