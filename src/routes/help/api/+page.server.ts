import { apiReference } from '$lib/server/openapi';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = () => ({ operations: apiReference() });
