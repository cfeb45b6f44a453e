import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { signUpSchema } from '@/lib/shared/validations/user';
import { createUser } from '@/lib/server/services/users';

/** Sign-up: creates an account (the client then signs in with it). */
export const POST = route(async (request) => {
  const input = await readJson(request, signUpSchema);
  const user = await createUser(input);
  return NextResponse.json({ user }, { status: 201 });
});
