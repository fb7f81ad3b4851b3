import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { z } from 'zod';
import { db } from '../db';
import { DUMMY_PASSWORD_HASH, verifyPassword } from './password';
import { authSecret } from './secret';
import { endSessions } from './session-current';
import { admitSignIn, clientAddress, settleSignIn } from './throttle';

const credentialsSchema = z.object({ email: z.string().trim().toLowerCase().email(), password: z.string().min(1).max(200) });

const secureCookies = (process.env.NEXTAUTH_URL ?? '').startsWith('https://');

export const authOptions: NextAuthOptions = {
  secret: authSecret(),
  session: { strategy: 'jwt', maxAge: 12 * 60 * 60 },
  useSecureCookies: secureCookies,
  pages: { signIn: '/sign-in' },
  providers: [
    CredentialsProvider({
      name: 'Email and password',
      credentials: { email: { label: 'Email', type: 'email' }, password: { label: 'Password', type: 'password' } },
      async authorize(raw, req) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) return null;
        const { email, password } = parsed.data;
        const address = clientAddress((req?.headers ?? {}) as Record<string, string>);
        const k = db();
        // Counted (atomically) before the password is checked: a refused attempt never reaches bcrypt.
        // The route handler answers 429 to callers it can see are waiting; this is the decision.
        const admission = await admitSignIn(k, email, address);
        if (!admission.allowed) throw new Error('Throttled');
        const user = await k('users').where({ email }).first();
        // an address without an account is compared against a dummy hash, so it takes as long as a wrong password
        const ok = (await verifyPassword(password, user?.passwordHash ?? DUMMY_PASSWORD_HASH)) && Boolean(user);
        await settleSignIn(k, email, address, ok);
        if (!ok) return null;
        return { id: String(user.id), email: user.email, name: user.name, passwordChangedAt: user.passwordChangedAt ?? null, sessionStamp: user.sessionStamp ?? null };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        // the stamps at sign-in; a later reset or sign-out makes them stale (lib/auth/session.ts)
        token.pwc = user.passwordChangedAt ?? null;
        token.sst = user.sessionStamp ?? null;
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user && typeof token.uid === 'number') {
        session.user.id = token.uid;
        session.user.passwordChangedAt = token.pwc ?? null;
        session.user.sessionStamp = token.sst ?? null;
      }
      return session;
    },
  },
  events: {
    // Signing out moves the user's session stamp, so a copy of this cookie (or any other session of the user) stops working.
    async signOut({ token }) {
      if (token && typeof token.uid === 'number') await endSessions(token.uid, { passwordChangedAt: token.pwc, sessionStamp: token.sst });
    },
  },
};
