import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireUser } from '@/lib/server/auth/session';
import { getNoticeSettings, updateNoticeSettings } from '@/lib/server/services/notices';
import { noticeSettingsSchema } from '@/lib/shared/validations/team';

export const GET = route(async (request) => {
  const user = await requireUser(request);
  return NextResponse.json({ notices: await getNoticeSettings(user.id) });
});

export const PUT = route(async (request) => {
  const user = await requireUser(request);
  const input = await readJson(request, noticeSettingsSchema);
  return NextResponse.json({ notices: await updateNoticeSettings(user.id, input) });
});
