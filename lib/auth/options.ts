import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { z } from 'zod';
import { db } from '../db';
import { verifyPassword } from './password';
import { authSecret } from './secret';
import { checkSignInThrottle, clientAddress, recordSignInAttempt } from './throttle';

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
        // The route handler refuses locked callers with 429 before this runs; this is the backstop.
        const state = await checkSignInThrottle(k, email, address);
        if (state.locked) throw new Error('Throttled');
        const user = await k('users').where({ email }).first();
        const ok = user ? await verifyPassword(password, user.passwordHash) : false;
        await recordSignInAttempt(k, email, address, ok);
        if (!ok) return null;
        return { id: String(user.id), email: user.email, name: user.name, passwordChangedAt: user.passwordChangedAt ?? null };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        // the password stamp at sign-in; a later reset makes it stale (lib/auth/session.ts)
        token.pwc = user.passwordChangedAt ?? null;
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user && typeof token.uid === 'number') {
        session.user.id = token.uid;
        session.user.passwordChangedAt = token.pwc ?? null;
      }
      return session;
    },
  },
};
