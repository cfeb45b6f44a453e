import 'next-auth';

declare module 'next-auth' {
  interface Session {
    user: { id: string; epoch?: number; sid?: string; name?: string | null; email?: string | null; image?: string | null };
  }
}

declare module 'next-auth/jwt' {
  interface JWT {
    /** The user's session epoch when the token was issued; a password reset raises it. */
    epoch?: number;
    /** The session's id, set at sign-in; signing out records its hash as ended. */
    sid?: string;
  }
}
