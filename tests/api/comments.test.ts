import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as comments from '../../src/pages/api/teams/[teamId]/comments/index';
import * as comment from '../../src/pages/api/teams/[teamId]/comments/[commentId]';
import * as notifications from '../../src/pages/api/notifications/index';
import * as markRead from '../../src/pages/api/notifications/read';
import * as preferences from '../../src/pages/api/account/preferences';
import * as teamRoute from '../../src/pages/api/teams/[teamId]';
import * as member from '../../src/pages/api/teams/[teamId]/members/[userId]';
import { pebbleBuild } from '../../db/demo/builds';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision } from '../../src/lib/server/db/builds';
import { findRecentActivity } from '../../src/lib/server/db/activity';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import type { Mailer, MailMessage } from '../../src/lib/server/mail';
import { sendMentionDigests, sendMentionMail } from '../../src/lib/server/mention-mail';
import { readUnsubscribeToken, unsubscribeToken } from '../../src/lib/server/tokens';
import type {
	CommentWriteResult,
	NotificationsDto,
	ThreadDto,
} from '../../src/lib/schemas/comments';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser, TEST_CONFIG } from '../helpers/fixtures';
import { startTestMail, type TestMail } from '../helpers/mail';
import { createTestDb, type TestDb } from '../helpers/test-db';

/** Threads beside a revision, @mentions, notifications in the app and by mail, unsubscribing. */
describe('comment threads and mentions', () => {
	let t: TestDb;
	let mail: TestMail;
	let sent: MailMessage[];
	let mailer: Mailer;
	let teamId: string;
	let otherTeam: string;
	let captain: AppUser;
	let writer: AppUser;
	let sam: AppUser;
	let viewer: AppUser;
	let stranger: AppUser;
	let revisionId: string;
	beforeAll(async () => {
		t = await createTestDb();
		mail = await startTestMail();
		sent = [];
		mailer = {
			send: async (m) => {
				sent.push(m);
				await mail.mailer.send(m);
			},
		};
		teamId = await makeTeam(t.db, 'Thread Team');
		otherTeam = await makeTeam(t.db, 'Rivals');
		captain = await makeUser(t.db, undefined, 'Cap Tain');
		writer = await makeUser(t.db, undefined, 'Wren Alder');
		sam = await makeUser(t.db, undefined, 'Sam Reyes');
		viewer = await makeUser(t.db, undefined, 'Sponsor Desk');
		// Bears a name the text mentions, but is in another team.
		stranger = await makeUser(t.db, undefined, 'Kim Park');
		await addMember(t.db, teamId, captain, 'captain');
		await addMember(t.db, teamId, writer, 'member');
		await addMember(t.db, teamId, sam, 'member');
		await addMember(t.db, teamId, viewer, 'viewer');
		await addMember(t.db, otherTeam, stranger, 'captain');
		const { buildId } = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Heron',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		const saved = await appendRevision(t.db, {
			buildId,
			parentId: null,
			document: pebbleBuild,
			message: 'Went to 1/0',
			authorId: writer.id,
		});
		if (!saved.ok) throw new Error('seed revision');
		revisionId = saved.revision.id;
	});
	afterAll(async () => {
		await mail?.close();
		await t?.drop();
	});

	const call = (
		module: Parameters<typeof callEndpoint>[0],
		method: string,
		who: AppUser,
		opts: { params?: Record<string, string>; body?: unknown; url?: string } = {},
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, who, mailer),
			params: { teamId, ...opts.params },
			request: jsonRequest(opts.url ?? '/x', method, opts.body),
		});
	const post = (who: AppUser, body: string, on = { on: 'revision', id: revisionId }) =>
		call(comments, 'POST', who, { body: { ...on, body } });
	const inbox = async (who: AppUser) =>
		(await (await call(notifications, 'GET', who)).json()) as NotificationsDto;

	it('a mention by a name with a space notifies that member at once, in the app and by mail', async () => {
		const res = await post(writer, '@Sam Reyes why did we go to 1/0 here? @Kim Park saw it too');
		expect(res.status).toBe(201);
		const r = (await res.json()) as CommentWriteResult;
		expect(r.mentioned).toEqual(['Sam Reyes']);
		// Kim is in another team: named back to the writer, never notified.
		expect(r.unknown).toEqual(['Kim']);
		expect((await inbox(stranger)).items).toHaveLength(0);
		const mine = await inbox(sam);
		expect(mine.unread).toBe(1);
		expect(mine.items[0]).toMatchObject({
			author: 'Wren Alder',
			subject: 'r1 of Heron',
			teamName: 'Thread Team',
			read: false,
		});
		expect(mine.items[0]!.href).toContain('/history?r=1#r1');
		// Mailed through the SMTP fake after the answer, with a link that stops it.
		const got = await mail.waitFor(sam.email);
		expect(got.subject).toBe('Wren Alder mentioned you on r1 of Heron');
		expect(got.text).toContain('why did we go to 1/0 here?');
		const m = sent.find((x) => x.to === sam.email)!;
		const link = m.headers!['List-Unsubscribe']!.slice(1, -1);
		expect(got.text).toContain(link);
		const token = new URL(link).searchParams.get('token')!;
		expect(readUnsubscribeToken(token, TEST_CONFIG.linkSigningKey)).toBe(sam.id);
	});

	it('the unsubscribe token is the person’s own and cannot be forged or moved', () => {
		const token = unsubscribeToken(sam.id, TEST_CONFIG.linkSigningKey);
		expect(readUnsubscribeToken(token, TEST_CONFIG.linkSigningKey)).toBe(sam.id);
		expect(readUnsubscribeToken(token, 'another key')).toBeNull();
		const [, mac] = token.split('.');
		const moved = `${Buffer.from(writer.id).toString('base64url')}.${mac}`;
		expect(readUnsubscribeToken(moved, TEST_CONFIG.linkSigningKey)).toBeNull();
		expect(readUnsubscribeToken('garbage', TEST_CONFIG.linkSigningKey)).toBeNull();
	});

	it('keeps markup and links as text: stored as written, escaped in the mail’s HTML', async () => {
		const body = '@Sam Reyes <img src=x onerror=alert(1)> see https://evil.test/?a=<b>';
		const res = await post(writer, body);
		const r = (await res.json()) as CommentWriteResult;
		expect(r.comment.body).toBe(body);
		await mail.waitFor(sam.email, { after: 1 });
		const m = sent.filter((x) => x.to === sam.email).at(-1)!;
		expect(m.html).not.toContain('<img');
		expect(m.html).toContain('&#60;img src=x onerror=alert(1)&#62;');
		expect(m.html).not.toContain('href="https://evil.test');
	});

	it('nobody is notified of their own mention; the thread reads oldest first', async () => {
		const r = (await (
			await post(sam, 'Noted, @Sam Reyes will check')
		).json()) as CommentWriteResult;
		expect(r.mentioned).toEqual(['Sam Reyes']);
		expect((await inbox(sam)).unread).toBe(2);
		const thread = (await (
			await call(comments, 'GET', viewer, { url: `/x?on=revision&id=${revisionId}` })
		).json()) as ThreadDto;
		expect(thread.comments.map((c) => c.authorName)).toEqual([
			'Wren Alder',
			'Wren Alder',
			'Sam Reyes',
		]);
		expect(thread.canComment).toBe(false);
		expect(thread.members.map((m) => m.name)).toContain('Sam Reyes');
	});

	it('viewers read but write only when a captain allows it', async () => {
		const refused = await post(viewer, 'Nice work');
		expect(refused.status).toBe(403);
		expect(
			(await call(teamRoute, 'PATCH', writer, { body: { viewersMayComment: true } })).status,
		).toBe(403);
		expect(
			(await call(teamRoute, 'PATCH', captain, { body: { viewersMayComment: true } })).status,
		).toBe(204);
		expect((await post(viewer, 'Nice work')).status).toBe(201);
		await call(teamRoute, 'PATCH', captain, { body: { viewersMayComment: false } });
		expect((await post(viewer, 'Again')).status).toBe(403);
	});

	it('a subject of another team is not found, and a bad subject is named', async () => {
		const res = await post(writer, 'x', { on: 'event', id: revisionId });
		expect(res.status).toBe(404);
		const bad = await post(writer, 'x', { on: 'vehicle', id: 'nope' });
		expect(bad.status).toBe(400);
		const fields = JSON.stringify(await bad.json());
		expect(fields).toContain('"on"');
		expect(fields).toContain('"id"');
		expect((await post(writer, '   ')).status).toBe(400);
		expect((await post(writer, 'x'.repeat(4001))).status).toBe(400);
	});

	it('the author changes or deletes within 15 minutes; a captain deletes any time', async () => {
		const r = (await (await post(writer, 'First thought')).json()) as CommentWriteResult;
		const params = { commentId: r.comment.id };
		expect(r.comment.canEdit).toBe(true);
		const byOther = await call(comment, 'PATCH', sam, { params, body: { body: 'hijack' } });
		expect(byOther.status).toBe(403);
		const changed = await call(comment, 'PATCH', writer, {
			params,
			body: { body: 'Second thought, @Sam Reyes' },
		});
		expect(changed.status).toBe(200);
		const c = (await changed.json()) as CommentWriteResult;
		expect(c.comment.editedAt).not.toBeNull();
		expect(c.mentioned).toEqual(['Sam Reyes']);
		await t.db
			.updateTable('comment')
			.set({ created_at: new Date(Date.now() - 16 * 60_000) })
			.where('id', '=', r.comment.id)
			.execute();
		const late = await call(comment, 'PATCH', writer, { params, body: { body: 'too late' } });
		expect(late.status).toBe(403);
		expect((await call(comment, 'DELETE', writer, { params })).status).toBe(403);
		expect((await call(comment, 'DELETE', captain, { params })).status).toBe(204);
		expect((await call(comment, 'DELETE', captain, { params })).status).toBe(404);
	});

	it('one person writing a flood of comments is slowed down (429), their text refused whole', async () => {
		const flooder = await makeUser(t.db, undefined, 'Fast Typist');
		await addMember(t.db, teamId, flooder, 'member');
		await t.db
			.insertInto('comment')
			.values(
				Array.from({ length: 60 }, (_, i) => ({
					team_id: teamId,
					revision_id: revisionId,
					author_id: flooder.id,
					body: `spam ${i}`,
				})),
			)
			.execute();
		const res = await post(flooder, '@Sam Reyes once more');
		expect(res.status).toBe(429);
		expect(res.headers.get('retry-after')).toBe('600');
		// Someone else writes on.
		expect((await post(writer, 'Meanwhile, fine')).status).toBe(201);
	});

	it('comments show in the team’s activity', async () => {
		const activity = await findRecentActivity(t.db, teamId);
		const c = activity.find((a) => a.kind === 'comment')!;
		expect(c.text).toContain('commented on r1 of Heron');
		expect(c.vehicleName).toBe('Heron');
	});

	it('notifications are the signed-in person’s own: anonymous callers get 401', async () => {
		for (const [module, method, body] of [
			[notifications, 'GET', undefined],
			[markRead, 'POST', { all: true }],
			[preferences, 'PATCH', { mentionMail: 'off' }],
		] as const) {
			const res = await callEndpoint(module, {
				locals: localsFor(t.db, null),
				request: jsonRequest('/x', method, body),
			});
			expect(res.status).toBe(401);
			expect(res.headers.get('content-type')).toBe('application/problem+json');
		}
	});

	it('marks read one or all, only the caller’s own', async () => {
		const before = await inbox(sam);
		const one = before.items.find((i) => !i.read)!;
		// Someone else's id marks nothing.
		const other = await call(markRead, 'POST', writer, { body: { ids: [one.id] } });
		expect(((await other.json()) as { marked: number }).marked).toBe(0);
		const res = await call(markRead, 'POST', sam, { body: { ids: [one.id] } });
		expect(await res.json()).toEqual({ marked: 1, unread: before.unread - 1 });
		await call(markRead, 'POST', sam, { body: { all: true } });
		expect((await inbox(sam)).unread).toBe(0);
		expect((await call(markRead, 'POST', sam, { body: { some: 1 } })).status).toBe(400);
	});

	it('a mention whose mail the SMTP service refuses is mailed by the next run of the job', async () => {
		const refusing: Mailer = {
			send: async () => {
				throw new Error('421 service not available');
			},
		};
		const res = await callEndpoint(comments, {
			locals: localsFor(t.db, writer, refusing),
			params: { teamId },
			request: jsonRequest('/x', 'POST', {
				on: 'revision',
				id: revisionId,
				body: '@Sam Reyes the mail server is down',
			}),
		});
		expect(res.status).toBe(201);
		const before = mail.count(sam.email);
		// The send after the answer failed and gave the mention back.
		await expect.poll(() => sendMentionMail(t.db, mailer, TEST_CONFIG), { timeout: 5000 }).toBe(1);
		await mail.waitFor(sam.email, { after: before });
		expect(await sendMentionMail(t.db, mailer, TEST_CONFIG)).toBe(0);
	});

	it('a daily digest goes once, however often the job runs', async () => {
		expect((await call(preferences, 'PATCH', sam, { body: { mentionMail: 'daily' } })).status).toBe(
			204,
		);
		const before = mail.count(sam.email);
		await post(writer, '@Sam Reyes the rear bank is warm after three burps');
		await post(captain, '@sam reyes check the ground strap too');
		// Not mailed at once: Sam chose the digest.
		expect(await sendMentionMail(t.db, mailer, TEST_CONFIG)).toBe(0);
		const now = new Date();
		const [first, second] = await Promise.all([
			sendMentionDigests(t.db, mailer, TEST_CONFIG, now),
			sendMentionDigests(t.db, mailer, TEST_CONFIG, now),
		]);
		expect(first + second).toBe(1);
		expect(await sendMentionDigests(t.db, mailer, TEST_CONFIG, now)).toBe(0);
		const digest = await mail.waitFor(sam.email, { after: before });
		expect(digest.subject).toBe('2 mentions of you today');
		expect(digest.text).toContain('rear bank is warm');
		expect(digest.text).toContain('ground strap');
		expect(mail.count(sam.email)).toBe(before + 1);
	});

	it('mail that is off stays off; the app still lists the mention', async () => {
		await call(preferences, 'PATCH', sam, { body: { mentionMail: 'off' } });
		const before = mail.count(sam.email);
		await post(writer, '@Sam Reyes one more');
		expect(await sendMentionMail(t.db, mailer, TEST_CONFIG)).toBe(0);
		expect(
			await sendMentionDigests(t.db, mailer, TEST_CONFIG, new Date(Date.now() + 86_400_000)),
		).toBe(0);
		expect(mail.count(sam.email)).toBe(before);
		expect((await inbox(sam)).unread).toBeGreaterThan(0);
	});

	it('a removed member’s notifications stop: none listed, none mailed', async () => {
		await call(preferences, 'PATCH', sam, { body: { mentionMail: 'immediate' } });
		// A mention waiting to be mailed when the member is removed.
		await t.db
			.insertInto('comment')
			.values({
				team_id: teamId,
				revision_id: revisionId,
				author_id: writer.id,
				body: '@Sam Reyes',
			})
			.returning('id')
			.executeTakeFirstOrThrow()
			.then((c) =>
				t.db
					.insertInto('notification')
					.values({ user_id: sam.id, team_id: teamId, comment_id: c.id })
					.execute(),
			);
		expect((await inbox(sam)).items.length).toBeGreaterThan(0);
		const removed = await call(member, 'DELETE', captain, { params: { userId: sam.id } });
		expect(removed.status).toBe(204);
		expect(await inbox(sam)).toMatchObject({ unread: 0, items: [] });
		const before = mail.count(sam.email);
		expect(await sendMentionMail(t.db, mailer, TEST_CONFIG)).toBe(0);
		expect(mail.count(sam.email)).toBe(before);
		// And a new mention of the name finds no member.
		const r = (await (await post(writer, '@Sam Reyes?')).json()) as CommentWriteResult;
		expect(r.mentioned).toEqual([]);
		expect(r.unknown).toEqual(['Sam']);
	});
});
