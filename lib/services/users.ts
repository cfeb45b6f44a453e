import bcrypt from 'bcryptjs';
import { UniqueConstraintError } from 'sequelize';
import { User } from '@/db/models';
import { db } from '@/db';
import { ConflictError } from '@/lib/api/errors';
import type { SignUpInput } from '@/lib/validations/user';

/** Creates an account; an e-mail already in use is a 409. */
export async function createUser(input: SignUpInput) {
  db();
  try {
    const user = await User.create({ email: input.email, name: input.name, passwordHash: await bcrypt.hash(input.password, 10) });
    return { id: user.id, email: user.email, name: user.name };
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new ConflictError('An account with this e-mail already exists. Sign in instead.');
    throw error;
  }
}
