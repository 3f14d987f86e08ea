import { db } from '$lib/server/db';
import { createDrill, drillInput, listDrills } from '$lib/server/drills';
import { readJson, Refusal, refusalResponse, signedIn } from '$lib/server/http';
import { canEnter, isRole } from '$lib/server/roles';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

function teacher(locals: App.Locals) {
	const user = signedIn(locals);
	if (!canEnter(isRole(user.role) ? user.role : undefined, 'teaching'))
		throw new Refusal(403, 'Only teachers write drills.');
	return user;
}

export const GET: RequestHandler = async ({ locals }) => {
	try {
		const user = teacher(locals);
		const drills = await listDrills(db, user.id);
		return json({
			drills: drills.map((d) => ({ id: d.id, name: d.name, mappingId: d.mappingId, updatedAt: d.updatedAt }))
		});
	} catch (e) {
		return refusalResponse(e);
	}
};

/** `{ mappingId, document }`: a drill document (version 1) played on one of your mappings. */
export const POST: RequestHandler = async ({ locals, request }) => {
	try {
		const user = teacher(locals);
		const body = await readJson(request, drillInput, 2 << 20);
		const id = await createDrill(db, user.id, body);
		return json({ id }, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
