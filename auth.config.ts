// @ts-check
// https://github.com/nowaythatworked/auth-astro#configure-authjs
import { CredentialsSignin } from '@auth/core/errors';
import Credentials from '@auth/core/providers/credentials';
import Nodemailer from '@auth/core/providers/nodemailer';
import { KyselyAdapter } from '@auth/kysely-adapter';
import { defineConfig } from 'auth-astro';
import { signInSchema } from './src/lib/schemas/account';
import { db } from './src/lib/server/db/index';
import {
	dropUnconfirmedPassword,
	findUserByEmail,
	sessionVersionOf,
} from './src/lib/server/db/users';
import { signInLinkMail } from './src/lib/server/mail-templates';
import { verifyPasswordOrDummy } from './src/lib/server/passwords';
import { recordSignInAttempt, signInLimited, takeRateSlot } from './src/lib/server/rate-limit';
import { currentClient } from './src/lib/server/request-context';
import { config, mailer } from './src/lib/server/services';
import { isDatabaseUnavailable } from './src/lib/server/unavailable';

/** A refused sign-in because of too many attempts: the sign-in page says so. */
class RateLimitedSignIn extends CredentialsSignin {
	code = 'rate_limited';
}

export default defineConfig({
	// Read at run time: auth-astro's own fallback only sees variables present at build time.
	secret: process.env.AUTH_SECRET,
	trustHost: true,
	// SAFETY: the adapter's Database type names the Auth.js tables only; ours has more tables and
	// extra columns (passwordHash, unitSystem), which the adapter never reads.
	adapter: KyselyAdapter(db as never),
	// Credentials sign-in needs JWT sessions (database sessions are for OAuth/e-mail only).
	session: { strategy: 'jwt', maxAge: 30 * 24 * 3600 },
	pages: { signIn: '/sign-in', verifyRequest: '/sign-in/check-mail', error: '/sign-in' },
	providers: [
		Credentials({
			credentials: {
				email: { label: 'E-mail' },
				password: { label: 'Password', type: 'password' },
			},
			// Every attempt that reaches the provider counts here, whatever path spelling or body
			// type carried it; an unknown address costs the same hashing time as a known one.
			async authorize(raw) {
				const parsed = signInSchema.safeParse(raw);
				if (!parsed.success) return null;
				const { email, password } = parsed.data;
				const client = currentClient();
				if (await signInLimited(db, email, client)) throw new RateLimitedSignIn();
				const user = await findUserByEmail(db, email);
				const ok = await verifyPasswordOrDummy(password, user?.passwordHash ?? null);
				await recordSignInAttempt(db, email, client, ok && !!user);
				if (!user || !ok) return null;
				return { id: user.id, email: user.email, name: user.name };
			},
		}),
		Nodemailer({
			server: config.smtpUrl,
			from: config.mailFrom,
			maxAge: 24 * 3600,
			async sendVerificationRequest({ identifier, url }) {
				// Counted per address and per client; a refused request sends nothing and looks the same.
				if (!(await takeRateSlot(db, 'link_mail', identifier, currentClient()))) return;
				await mailer.send(signInLinkMail({ to: identifier, url }));
			},
		}),
	],
	callbacks: {
		async signIn({ user, account }) {
			// Following an e-mailed link proves the address. A password set before anyone proved it
			// (someone else may have signed up with this address) is dropped, and every session made
			// with it ends, so it never reaches what the owner does from now on.
			if (account?.type === 'email' && user?.id) await dropUnconfirmedPassword(db, user.id);
			return true;
		},
		async jwt({ token, user }) {
			if (user?.id) {
				token.uid = user.id;
				token.sv = await sessionVersionOf(db, user.id);
				return token;
			}
			if (typeof token.uid !== 'string') return null;
			// A password reset or a first e-mail sign-in bumps the account's session version: any
			// session issued under an older one ends here.
			try {
				const current = await sessionVersionOf(db, token.uid);
				if (current === null || current !== (typeof token.sv === 'number' ? token.sv : 0))
					return null;
			} catch (error) {
				// While the database is down nothing can be read anyway; keep the session rather than
				// signing everyone out.
				if (!isDatabaseUnavailable(error)) throw error;
			}
			return token;
		},
		session({ session, token }) {
			if (session.user && typeof token.uid === 'string')
				(session.user as { id?: string }).id = token.uid;
			return session;
		},
	},
});
