// An in-process Vite server for the audio harness: `$lib` resolves to src/lib as in the app.
import { createServer, type ViteDevServer } from 'vite';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));

export async function serveHarness(port = 0): Promise<{ url: string; server: ViteDevServer }> {
	const server = await createServer({
		configFile: false,
		root: here,
		logLevel: 'error',
		resolve: { alias: { $lib: resolve(here, '../../../src/lib') } },
		server: { port, host: '127.0.0.1', strictPort: false }
	});
	await server.listen();
	const address = server.httpServer?.address();
	const actual = typeof address === 'object' && address ? address.port : port;
	return { url: `http://127.0.0.1:${actual}/`, server };
}
