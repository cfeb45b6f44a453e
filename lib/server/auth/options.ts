import { randomBytes } from 'node:crypto';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { clientAddress } from '@/lib/server/auth/client-address';
import { endSession } from '@/lib/server/auth/ended-sessions';
import { verifyCredentials } from './credentials';

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
        // The session's own id, fixed at sign-in and kept when the token is re-issued: signing out
        // records it as ended, so a copy of the cookie stops working too.
        token.sid = randomBytes(24).toString('base64url');
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user && token.sub) {
        session.user.id = token.sub;
        session.user.epoch = typeof token.epoch === 'number' ? token.epoch : 0;
        session.user.sid = typeof token.sid === 'string' ? token.sid : undefined;
      }
      return session;
    },
  },
  events: {
    async signOut({ token }) {
      await endSession(token);
    },
  },
};
