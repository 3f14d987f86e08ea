import { error } from '@sveltejs/kit';
import { submissionFor } from '$lib/server/assignments';
import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { getMapping, listMappings } from '$lib/server/mappings';
import { getRehearsal } from '$lib/server/rehearsals';
import { requireArea } from '$lib/server/roles';
import { parseMoment } from '$lib/replay/time';
import type { PageServerLoad } from './$types';

const refused = (e: unknown): never => {
	if (e instanceof Refusal) error(e.status, e.message);
	throw e;
};

/** The other mapping to replay against, or why it can't be used (shown on the page, not a 404). */
async function againstMapping(userId: string, id: string | null, versionParam: string | null) {
	if (!id) return { against: null, againstProblem: null };
	const version = versionParam === null ? undefined : Number(versionParam);
	if (version !== undefined && !(Number.isInteger(version) && version > 0)) {
		return {
			against: null,
			againstProblem: `“${versionParam}” is not a mapping version: versions are whole numbers from 1.`
		};
	}
	try {
		const m = await getMapping(db, userId, id, version);
		return {
			against: {
				id: m.id,
				name: m.name,
				version: m.versions.find((v) => v.id === m.versionId)!.version,
				document: m.document
			},
			againstProblem: null
		};
	} catch (e) {
		if (e instanceof Refusal) return { against: null, againstProblem: e.message };
		throw e;
	}
}

/** Whose session to read: the user's own, or a student's reached through a submission to the user's class. */
async function sessionOwner(userId: string, id: string, submissionId: string | null): Promise<string> {
	if (!submissionId) return userId;
	const s = await submissionFor(db, userId, submissionId).catch(refused);
	if (s.rehearsalId !== id) error(404, 'That session does not exist, or it belongs to someone else.');
	return s.studentId;
}

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireArea(locals, 'app');
	const owner = await sessionOwner(user.id, params.id, url.searchParams.get('submission'));
	const [rehearsal, mappings, other] = await Promise.all([
		getRehearsal(db, owner, params.id).catch(refused),
		listMappings(db, user.id),
		againstMapping(user.id, url.searchParams.get('against'), url.searchParams.get('version'))
	]);
	const { row, session, mapping } = rehearsal;
	const recorded = row.mappingId ? await getMapping(db, user.id, row.mappingId).catch(() => null) : null;
	return {
		session: {
			id: row.id,
			name: row.name,
			tempo: row.tempo,
			startedAt: row.startedAt,
			status: row.status,
			mappingName: row.mappingName,
			mappingId: recorded?.id ?? null,
			mappingVersion: recorded?.versions.find((v) => v.id === row.mappingVersionId)?.version ?? null,
			newestVersion: recorded?.version ?? null,
			hasAudio: row.audioFile !== null,
			mappingDeleted: row.mappingId !== null && recorded === null && mapping !== null
		},
		document: session,
		mapping,
		...other,
		mappings: mappings.map((m) => ({ id: m.id, name: m.name, version: m.version, mine: m.mine })),
		moment: parseMoment(url.searchParams.get('t'))
	};
};
