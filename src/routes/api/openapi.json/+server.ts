import { publicOrigin } from '$lib/server/config';
import { openApiDocument } from '$lib/server/openapi';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** The OpenAPI document of the JSON API (public: it describes, it holds no data). */
export const GET: RequestHandler = () => json(openApiDocument(publicOrigin()));
