// @ts-check
// https://github.com/nowaythatworked/auth-astro#configure-authjs
import Credentials from '@auth/core/providers/credentials';
import Nodemailer from '@auth/core/providers/nodemailer';
import { KyselyAdapter } from '@auth/kysely-adapter';
import { defineConfig } from 'auth-astro';
import { signInSchema } from './src/lib/schemas/account';
import { db } from './src/lib/server/db/index';
import { findUserByEmail } from './src/lib/server/db/users';
import { signInLinkMail } from './src/lib/server/mail-templates';
import { verifyPassword } from './src/lib/server/passwords';
import { config, mailer } from './src/lib/server/services';

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
			credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
			async authorize(raw) {
				const parsed = signInSchema.safeParse(raw);
				if (!parsed.success) return null;
				const user = await findUserByEmail(db, parsed.data.email);
				if (!user || !(await verifyPassword(parsed.data.password, user.passwordHash))) return null;
				return { id: user.id, email: user.email, name: user.name };
			},
		}),
		Nodemailer({
			server: config.smtpUrl,
			from: config.mailFrom,
			maxAge: 24 * 3600,
			async sendVerificationRequest({ identifier, url }) {
				await mailer.send(signInLinkMail({ to: identifier, url }));
			},
		}),
	],
	callbacks: {
		jwt({ token, user }) {
			if (user?.id) token.uid = user.id;
			return token;
		},
		session({ session, token }) {
			if (session.user && typeof token.uid === 'string') (session.user as { id?: string }).id = token.uid;
			return session;
		},
	},
});
