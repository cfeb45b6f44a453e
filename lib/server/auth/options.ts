import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { verifyCredentials } from './credentials';

/** The caller's address for rate limits: the first X-Forwarded-For hop, X-Real-IP, or "local". */
export function clientAddress(headers: Record<string, unknown> | undefined): string {
  const forwarded = headers?.['x-forwarded-for'];
  const first = typeof forwarded === 'string' ? forwarded.split(',')[0]?.trim() : undefined;
  const real = headers?.['x-real-ip'];
  return first || (typeof real === 'string' ? real : '') || 'local';
}

export const authOptions: NextAuthOptions = {
  session: { strategy: 'jwt', maxAge: 7 * 24 * 60 * 60 },
  pages: { signIn: '/sign-in' },
  providers: [
    CredentialsProvider({
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials, req) {
        if (!credentials?.email || !credentials.password) return null;
        return verifyCredentials(credentials.email, credentials.password, clientAddress(req?.headers));
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        token.epoch = (user as { sessionEpoch?: number }).sessionEpoch ?? 0;
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user && token.sub) {
        session.user.id = token.sub;
        session.user.epoch = typeof token.epoch === 'number' ? token.epoch : 0;
      }
      return session;
    },
  },
};
