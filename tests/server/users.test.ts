import { openDatabase } from '$lib/server/db';
import { mapping, rehearsal, rehearsalChunk, user } from '$lib/server/db/schema';
import { listMappings } from '$lib/server/mappings';
import { appendChunk, createRehearsal } from '$lib/server/rehearsals';
import {
	changeRole,
	deleteAccountData,
	heirFor,
	lastAdminProblem,
	listUsers,
	RoleChangeError
} from '$lib/server/users';
import { eq } from 'drizzle-orm';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';

let t: Awaited<ReturnType<typeof demoDatabase>>;
let ines: string;
beforeEach(async () => {
	t = await demoDatabase();
	ines = (await listUsers(t.db, 'ines@'))[0].id;
});
afterEach(() => t.close());

describe('the last admin', () => {
	it('survives two admins demoting each other at the same moment from two app instances', async () => {
		await changeRole(t.db, t.teacher, 'admin');
		const other = openDatabase(`file:${t.file}`);
		try {
			const results = await Promise.allSettled([
				changeRole(t.db, ines, 'student'),
				changeRole(other.db, t.teacher, 'student')
			]);
			expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(1);
			const refused = results.find((r) => r.status === 'rejected') as PromiseRejectedResult;
			expect(refused.reason).toBeInstanceOf(RoleChangeError);
			const admins = (await listUsers(t.db)).filter((u) => u.role === 'admin');
			expect(admins).toHaveLength(1);
		} finally {
			other.client.close();
		}
	});

	it('does not count a disabled admin', async () => {
		await changeRole(t.db, t.teacher, 'admin');
		await t.db.update(user).set({ banned: true }).where(eq(user.id, t.teacher));
		await expect(changeRole(t.db, ines, 'teacher')).rejects.toThrow(/at least one admin/);
		expect(await lastAdminProblem(t.db, ines)).toMatch(/at least one admin/);
		expect(await lastAdminProblem(t.db, t.kai)).toBeNull();
	});
});

describe('deleting an account’s data', () => {
	it('removes the person’s sessions and mappings, keeps public mappings others rehearsed with for an admin', async () => {
		const demos = await listMappings(t.db, t.teacher);
		const used = demos.find((m) => m.name === 'Two-deck pad set')!;
		const kaiTake = await createRehearsal(t.db, t.kai, { mappingId: used.id, tempo: 120 });
		const ownTake = await createRehearsal(t.db, t.teacher, { mappingId: demos[0].id, tempo: 120 });
		await appendChunk(t.db, t.teacher, ownTake.id, { seq: 0, events: [] });

		const heir = await heirFor(t.db, t.teacher);
		expect(heir).toBe(ines);
		const { keptMappings } = await deleteAccountData(t.db, t.teacher, heir);
		expect(keptMappings).toBe(1);

		const left = await t.db.select().from(mapping);
		expect(left.map((m) => [m.id, m.ownerId])).toEqual([[used.id, ines]]);
		expect(await t.db.select().from(rehearsal).where(eq(rehearsal.ownerId, t.teacher))).toEqual([]);
		expect(await t.db.select().from(rehearsalChunk).where(eq(rehearsalChunk.rehearsalId, ownTake.id))).toEqual([]);
		const [kaiRow] = await t.db.select().from(rehearsal).where(eq(rehearsal.id, kaiTake.id));
		expect(kaiRow.mappingId).toBe(used.id);
		expect(kaiRow.mappingVersionId).not.toBeNull();
	});

	it('without an heir deletes every mapping and unlinks other people’s sessions from them', async () => {
		const [demo] = await listMappings(t.db, t.teacher);
		const kaiTake = await createRehearsal(t.db, t.kai, { mappingId: demo.id, tempo: 100 });
		await deleteAccountData(t.db, t.teacher, null);
		expect(await t.db.select().from(mapping)).toEqual([]);
		const [kaiRow] = await t.db.select().from(rehearsal).where(eq(rehearsal.id, kaiTake.id));
		expect(kaiRow).toMatchObject({ mappingId: null, mappingVersionId: null, mappingName: demo.name });
	});
});
