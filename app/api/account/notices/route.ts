import { NextResponse } from 'next/server';
import { route } from '@/lib/api/handler';
import { readJson } from '@/lib/api/read-json';
import { requireUser } from '@/lib/auth/session';
import { getNoticeSettings, updateNoticeSettings } from '@/lib/services/notices';
import { noticeSettingsSchema } from '@/lib/validations/team';

export const GET = route(async (request) => {
  const user = await requireUser(request);
  return NextResponse.json({ notices: await getNoticeSettings(user.id) });
});

export const PUT = route(async (request) => {
  const user = await requireUser(request);
  const input = await readJson(request, noticeSettingsSchema);
  return NextResponse.json({ notices: await updateNoticeSettings(user.id, input) });
});
