import { db } from '$lib/server/db';
import { drillFor } from '$lib/server/drills';
import { refusalResponse, signedIn } from '$lib/server/http';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** The drill document; `?download` as a file. Its owner, or a student it is assigned to. */
export const GET: RequestHandler = async ({ locals, params, url }) => {
	try {
		const d = await drillFor(db, signedIn(locals).id, params.id);
		if (url.searchParams.has('download')) {
			const file = `${d.document.name.replace(/[^\w.-]+/g, '-').replace(/^-|-$/g, '') || 'drill'}.drill.json`;
			return new Response(JSON.stringify(d.document, null, 2) + '\n', {
				headers: {
					'content-type': 'application/json; charset=utf-8',
					'content-disposition': `attachment; filename="${file}"`
				}
			});
		}
		return json({ id: d.row.id, mappingId: d.row.mappingId, mappingVersion: d.mappingVersion, document: d.document });
	} catch (e) {
		return refusalResponse(e);
	}
};
