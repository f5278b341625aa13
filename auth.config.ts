/**
 * Auth.js configuration (read by auth-astro): e-mail and password through the Credentials
 * provider, sessions as an encrypted JWT in an httpOnly, SameSite=Lax cookie (Secure when
 * PUBLIC_URL is https). Secrets come from the run-time configuration, never from the build.
 */
import Credentials from '@auth/core/providers/credentials';
import { eq } from 'drizzle-orm';
import { defineConfig } from 'auth-astro';
import { users } from './src/db/schema';
import { getConfig } from './src/lib/server/config';
import { getDb } from './src/lib/server/db';
import { unknownUserHash, verifyPassword } from './src/lib/server/passwords';
import { maxSignInEmailLength, normaliseSignInEmail } from './src/lib/server/sign-in-limit';
import { safeRedirectUrl } from './src/lib/safe-path';

const config = getConfig();

export default defineConfig({
  secret: config.authSecret,
  trustHost: true,
  useSecureCookies: config.secureCookies,
  session: { strategy: 'jwt', maxAge: 7 * 24 * 3600, updateAge: 24 * 3600 },
  pages: { signIn: '/signin', error: '/signin' },
  providers: [
    Credentials({
      credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials) {
        // The same reading as the sign-in limit's (src/lib/server/sign-in-limit.ts), so both count one address.
        const email = normaliseSignInEmail(credentials?.email);
        const password = String(credentials?.password ?? '');
        if (!email || email.length > maxSignInEmailLength || !password || password.length > 200) return null;
        const user = getDb().select().from(users).where(eq(users.email, email)).get();
        // Compare against a fixed hash when the address is unknown, so timing says nothing.
        const matches = await verifyPassword(password, user?.passwordHash ?? unknownUserHash);
        if (!user || !matches) return null;
        return { id: user.id, email: user.email, name: user.name, epoch: user.sessionEpoch } as never;
      },
    }),
  ],
  callbacks: {
    // Only a path on this site, whatever `callbackUrl` holds (src/lib/safe-path.ts): no open
    // redirect, and no control character reaching a cookie or Location header.
    redirect({ url, baseUrl }) {
      return safeRedirectUrl(url, baseUrl);
    },
    jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        token.epoch = (user as { epoch?: number }).epoch ?? 0;
      }
      return token;
    },
    session({ session, token }) {
      if (token.sub) session.user.id = token.sub;
      return session;
    },
  },
  logger: {
    // A wrong password is an expected outcome, not a server error worth a stack trace.
    error(error) {
      if (error.name === 'CredentialsSignin' || error.name === 'MissingCSRF') return;
      console.error('[auth]', error);
    },
    warn() {},
  },
});
