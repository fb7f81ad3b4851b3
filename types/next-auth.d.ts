import 'next-auth';
import 'next-auth/jwt';

declare module 'next-auth' {
  interface Session {
    user: { id: number; email?: string | null; name?: string | null; passwordChangedAt?: string | null; sessionStamp?: string | null };
  }
  interface User {
    passwordChangedAt?: string | null;
    sessionStamp?: string | null;
  }
}

declare module 'next-auth/jwt' {
  interface JWT {
    uid?: number;
    /** users.passwordChangedAt when this token was issued */
    pwc?: string | null;
    /** users.sessionStamp when this token was issued (moved by a sign-out) */
    sst?: string | null;
  }
}
