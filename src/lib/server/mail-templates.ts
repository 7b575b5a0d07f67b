import type { MailMessage } from './mail';

const escape = (s: string) =>
	s.replace(
		/[&<>"']/g,
		(c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
	);

function layout(
	title: string,
	paragraphs: string[],
	action: { label: string; url: string },
	footnote: string,
): string {
	return `<!doctype html><html><body style="margin:0;background:#f7f5f0;font-family:system-ui,sans-serif;color:#1d262e">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="background:#ffffff;border:1px solid #ddd8cc;border-radius:6px">
<tr><td style="background:#16202a;color:#f7f5f0;padding:16px 24px;font-weight:700;font-size:18px">Sagwise</td></tr>
<tr><td style="padding:24px">
<h1 style="font-size:20px;margin:0 0 12px">${escape(title)}</h1>
${paragraphs.map((p) => `<p style="margin:0 0 12px;line-height:1.5">${escape(p)}</p>`).join('')}
<p style="margin:20px 0"><a href="${escape(action.url)}" style="background:#a85a23;color:#ffffff;padding:10px 18px;border-radius:6px;text-decoration:none;font-weight:600">${escape(action.label)}</a></p>
<p style="margin:0 0 12px;font-size:13px;color:#55616b">Or paste this address into your browser: ${escape(action.url)}</p>
<p style="margin:0;font-size:13px;color:#55616b">${escape(footnote)}</p>
</td></tr></table></td></tr></table></body></html>`;
}

const text = (
	title: string,
	paragraphs: string[],
	action: { label: string; url: string },
	footnote: string,
) =>
	[
		title,
		'',
		...paragraphs,
		'',
		`${action.label}: ${action.url}`,
		'',
		footnote,
		'',
		'— Sagwise',
	].join('\n');

function message(
	to: string,
	subject: string,
	title: string,
	paragraphs: string[],
	action: { label: string; url: string },
	footnote: string,
): MailMessage {
	return {
		to,
		subject,
		text: text(title, paragraphs, action, footnote),
		html: layout(title, paragraphs, action, footnote),
	};
}

export function invitationMail(p: {
	to: string;
	teamName: string;
	role: string;
	inviterName: string;
	url: string;
	expiresAt: Date;
}): MailMessage {
	return message(
		p.to,
		`${p.inviterName} invited you to ${p.teamName} on Sagwise`,
		`Join ${p.teamName}`,
		[
			`${p.inviterName} invited you to join the team ${p.teamName} as ${p.role === 'viewer' ? 'a viewer' : `a ${p.role}`}.`,
			'Sagwise is where the team plans and records the electrical systems of its vehicles and logs its event results.',
		],
		{ label: 'Accept the invitation', url: p.url },
		`The link works once and expires on ${p.expiresAt.toUTCString()}. If you did not expect this, ignore this mail.`,
	);
}

export function passwordResetMail(p: { to: string; url: string }): MailMessage {
	return message(
		p.to,
		'Reset your Sagwise password',
		'Choose a new password',
		[
			'Someone asked to reset the password of this Sagwise account. If it was you, choose a new one with the link below.',
		],
		{ label: 'Choose a new password', url: p.url },
		'The link works once and expires in one hour. If you did not ask for it, ignore this mail; your password stays as it is.',
	);
}

export function signInLinkMail(p: { to: string; url: string }): MailMessage {
	return message(
		p.to,
		'Your Sagwise sign-in link',
		'Sign in to Sagwise',
		['Use the link below to sign in. No password needed.'],
		{ label: 'Sign in', url: p.url },
		'The link works once and expires in 24 hours. If you did not ask for it, ignore this mail.',
	);
}
