// Deleting rows other rows depend on. SQLite enforces foreign keys — and with them ON DELETE
// CASCADE — per connection, and a remote libSQL database or a connection opened outside
// prepareDatabase may have them off; so every delete here removes the dependent rows itself,
// children first, inside the caller's write transaction. The result is the same with foreign keys
// on or off. Each helper answers the upload-store files whose rows it removed; the caller removes
// them with `removeFiles` once the transaction has committed.
import { inArray, type SQL } from 'drizzle-orm';
import type { Tx } from './db';
import {
	assignment,
	classInvite,
	classMapping,
	classMember,
	drill,
	drillTake,
	mapping,
	mappingVersion,
	mappingVersionV1,
	rehearsal,
	rehearsalChunk,
	schoolClass,
	submission
} from './db/schema';
import { uploadStore, type UploadStore } from './storage';

const named = (rows: { file: string | null }[]) => rows.flatMap((r) => (r.file ? [r.file] : []));

/** Submissions matching `where`, with their audio files. */
export async function removeSubmissions(tx: Tx, where: SQL): Promise<string[]> {
	return named(await tx.delete(submission).where(where).returning({ file: submission.audioFile }));
}

/** Assignments matching `where`, with their submissions. */
export async function removeAssignments(tx: Tx, where: SQL): Promise<string[]> {
	const ids = (await tx.select({ id: assignment.id }).from(assignment).where(where)).map((r) => r.id);
	if (!ids.length) return [];
	const files = await removeSubmissions(tx, inArray(submission.assignmentId, ids));
	await tx.delete(assignment).where(inArray(assignment.id, ids));
	return files;
}

/** Drills matching `where`, with their assignments (and submissions) and the scored takes of them. */
export async function removeDrills(tx: Tx, where: SQL): Promise<string[]> {
	const ids = (await tx.select({ id: drill.id }).from(drill).where(where)).map((r) => r.id);
	if (!ids.length) return [];
	const files = await removeAssignments(tx, inArray(assignment.drillId, ids));
	await tx.delete(drillTake).where(inArray(drillTake.drillId, ids));
	await tx.delete(drill).where(inArray(drill.id, ids));
	return files;
}

/** Classes matching `where`, with their assignments, members, invitations and shared mappings (the mappings stay). */
export async function removeClasses(tx: Tx, where: SQL): Promise<string[]> {
	const ids = (await tx.select({ id: schoolClass.id }).from(schoolClass).where(where)).map((r) => r.id);
	if (!ids.length) return [];
	const files = await removeAssignments(tx, inArray(assignment.classId, ids));
	await tx.delete(classMapping).where(inArray(classMapping.classId, ids));
	await tx.delete(classInvite).where(inArray(classInvite.classId, ids));
	await tx.delete(classMember).where(inArray(classMember.classId, ids));
	await tx.delete(schoolClass).where(inArray(schoolClass.id, ids));
	return files;
}

/**
 * Sessions matching `where` (a condition on `rehearsal` that deleting their dependants does not
 * change), with their events, scored takes and submissions; answers how many went and the audio
 * files of the sessions and submissions.
 */
export async function removeSessions(tx: Tx, where: SQL): Promise<{ count: number; files: string[] }> {
	const ids = tx.select({ id: rehearsal.id }).from(rehearsal).where(where);
	const files = await removeSubmissions(tx, inArray(submission.rehearsalId, ids));
	await tx.delete(drillTake).where(inArray(drillTake.rehearsalId, ids));
	await tx.delete(rehearsalChunk).where(inArray(rehearsalChunk.rehearsalId, ids));
	const gone = await tx.delete(rehearsal).where(where).returning({ file: rehearsal.audioFile });
	return { count: gone.length, files: [...files, ...named(gone)] };
}

/**
 * Mappings matching `where`, with their versions. Sessions recorded with them lose the link (they
 * keep the mapping's name); drills played on them go, with everything that hangs on those drills.
 * Callers spare the mappings others rely on before calling this.
 */
export async function removeMappings(tx: Tx, where: SQL): Promise<{ count: number; files: string[] }> {
	const ids = (await tx.select({ id: mapping.id }).from(mapping).where(where)).map((r) => r.id);
	if (!ids.length) return { count: 0, files: [] };
	const versions = tx
		.select({ id: mappingVersion.id })
		.from(mappingVersion)
		.where(inArray(mappingVersion.mappingId, ids));
	await tx.update(rehearsal).set({ mappingVersionId: null }).where(inArray(rehearsal.mappingVersionId, versions));
	await tx.update(rehearsal).set({ mappingId: null }).where(inArray(rehearsal.mappingId, ids));
	const files = await removeDrills(tx, inArray(drill.mappingId, ids));
	files.push(...(await removeDrills(tx, inArray(drill.mappingVersionId, versions))));
	await tx.delete(classMapping).where(inArray(classMapping.mappingId, ids));
	await tx.delete(mappingVersionV1).where(inArray(mappingVersionV1.versionId, versions));
	await tx.delete(mappingVersion).where(inArray(mappingVersion.mappingId, ids));
	await tx.delete(mapping).where(inArray(mapping.id, ids));
	return { count: ids.length, files };
}

/** Removes files whose rows are gone. A file that cannot be removed is reported, not fatal: its rows are gone already. */
export async function removeFiles(files: string[], store: UploadStore = uploadStore()) {
	for (const file of new Set(files))
		await store.remove(file).catch((e) => console.error(`The upload ${file} could not be removed:`, e));
}
