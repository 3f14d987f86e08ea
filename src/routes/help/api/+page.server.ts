import { TOKEN_PREFIX } from '$lib/server/api-tokens';
import { publicOrigin, tokenRequestsPerMinute } from '$lib/server/config';
import { apiReference } from '$lib/server/openapi';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = () => ({
	operations: apiReference(),
	tokens: { perMinute: tokenRequestsPerMinute(), prefix: TOKEN_PREFIX, origin: publicOrigin() }
});
