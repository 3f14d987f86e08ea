import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';
import { copyFileSync, readFileSync, renameSync, writeFileSync } from 'node:fs';

/**
 * adapter-node with Padproof's server entry in front of its own: `node build` runs
 * scripts/server-entry.js (copied to build/index.js), which lifts the adapter's 512 KB body cap
 * (the app enforces its own limits, per route, while bodies stream) and then starts the adapter's
 * server (moved to build/server-start.js).
 */
function padproofAdapter() {
	const node = adapter({ out: 'build' });
	return {
		...node,
		/** @param {import('@sveltejs/kit').Builder} builder */
		async adapt(builder) {
			await node.adapt(builder);
			const start = readFileSync('build/index.js', 'utf8').replace(
				/sourceMappingURL=index\.js\.map\s*$/,
				'sourceMappingURL=server-start.js.map\n'
			);
			writeFileSync('build/server-start.js', start);
			renameSync('build/index.js.map', 'build/server-start.js.map');
			copyFileSync('scripts/server-entry.js', 'build/index.js');
		}
	};
}

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: padproofAdapter(),
		// Content security policy of every page (SvelteKit adds a nonce for its own inline script).
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				// Tone.js and our bit-crusher load AudioWorklet processors and the clock worker from blob: URLs.
				'script-src': ['self', 'blob:'],
				'worker-src': ['self', 'blob:'],
				'connect-src': ['self', 'blob:'],
				// Svelte's style: directives and transitions write inline style attributes.
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self', 'data:'],
				'media-src': ['self', 'blob:'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
