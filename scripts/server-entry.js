// Padproof's server entry: `node build` runs this file (the build copies it to build/index.js,
// see svelte.config.js), then the adapter's own server (build/server-start.js).
import process from 'node:process';

// adapter-node caps every request body at 512 KB before the app sees it, which would refuse a
// recorded take of more than half a minute. Padproof enforces its own limits while bodies stream:
// uploads and JSON endpoints per route, everything else at 1 MiB (src/lib/server/guard.ts).
process.env.BODY_SIZE_LIMIT ??= 'Infinity';

try {
	const { server } = await import('./server-start.js');
	// Static files are served before the app's hooks run; they get the same two safe headers.
	server.server.prependListener('request', (_request, response) => {
		response.setHeader('x-content-type-options', 'nosniff');
		response.setHeader('referrer-policy', 'same-origin');
	});
} catch (error) {
	// A setting that stops the start (src/lib/server/config.ts) is printed alone, without a stack.
	if (error?.name === 'ConfigError') {
		console.error(error.message);
		process.exit(1);
	}
	throw error;
}
