import { format } from 'date-fns';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { appendRevision } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { sendEventReminders, sendRevisionDigests } from '../../src/lib/server/reminders';
import { addMember, makeTeam, makeUser, TEST_CONFIG } from '../helpers/fixtures';
import { startTestMail, type TestMail } from '../helpers/mail';
import { createTestDb, type TestDb } from '../helpers/test-db';

const inDays = (n: number) => format(new Date(Date.now() + n * 86_400_000), 'yyyy-MM-dd');

describe('scheduled mail jobs', () => {
	let t: TestDb;
	let mail: TestMail;
	beforeAll(async () => {
		t = await createTestDb();
		mail = await startTestMail();
	});
	afterAll(async () => {
		await mail?.close();
		await t?.drop();
	});

	it('sends each event reminder once, however often the job runs', async () => {
		const teamId = await makeTeam(t.db, 'Reminder Team');
		await t.db.updateTable('team').set({ reminder_days: 5 }).where('id', '=', teamId).execute();
		const a = await makeUser(t.db, 'remind.a@sagwise.test');
		const b = await makeUser(t.db, 'remind.b@sagwise.test');
		await addMember(t.db, teamId, a, 'captain');
		await addMember(t.db, teamId, b, 'viewer');
		await t.db
			.insertInto('event')
			.values([
				{ team_id: teamId, name: 'Soon Meet', starts_on: inDays(3), ends_on: inDays(3) },
				{ team_id: teamId, name: 'Far Meet', starts_on: inDays(20), ends_on: inDays(20) },
				{ team_id: teamId, name: 'Past Meet', starts_on: inDays(-2), ends_on: inDays(-2) },
			])
			.execute();
		const [first, second] = await Promise.all([
			sendEventReminders(t.db, mail.mailer, TEST_CONFIG),
			sendEventReminders(t.db, mail.mailer, TEST_CONFIG),
		]);
		expect(first + second).toBe(2);
		expect(await sendEventReminders(t.db, mail.mailer, TEST_CONFIG)).toBe(0);
		await mail.waitFor('remind.a@sagwise.test');
		await mail.waitFor('remind.b@sagwise.test');
		await new Promise((r) => setTimeout(r, 200));
		expect(mail.count('remind.a@sagwise.test')).toBe(1);
		expect(mail.count('remind.b@sagwise.test')).toBe(1);
		expect((await mail.waitFor('remind.a@sagwise.test')).subject).toMatch(/Soon Meet/);
	});

	it('digests new revisions to captains once', async () => {
		const teamId = await makeTeam(t.db, 'Digest Team');
		const captain = await makeUser(t.db, 'digest.captain@sagwise.test');
		const member = await makeUser(t.db, 'digest.member@sagwise.test');
		await addMember(t.db, teamId, captain, 'captain');
		await addMember(t.db, teamId, member, 'member');
		const { buildId } = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Digest car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		await appendRevision(t.db, {
			buildId,
			parentId: null,
			document: pebbleBuild,
			message: 'New run cable',
			authorId: member.id,
		});
		expect(await sendRevisionDigests(t.db, mail.mailer, TEST_CONFIG)).toBeGreaterThanOrEqual(1);
		const digest = await mail.waitFor('digest.captain@sagwise.test');
		expect(digest.text).toMatch(/Digest car r1: New run cable/);
		expect(mail.count('digest.member@sagwise.test')).toBe(0);
		const before = mail.count('digest.captain@sagwise.test');
		await sendRevisionDigests(t.db, mail.mailer, TEST_CONFIG);
		await new Promise((r) => setTimeout(r, 200));
		expect(mail.count('digest.captain@sagwise.test')).toBe(before);
	});
});
