// `npm run bench`: runs every tests/bench/*.bench.ts (or only those whose name contains argv[2])
// and prints one JSON object per figure (DESIGN.md §8). A benchmark measures; it never fails
// for being slow, only for being broken.
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export interface Figure {
	name: string;
	value: number;
	unit: string;
}

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv[2];
const files = readdirSync(here)
	.filter((f) => f.endsWith('.bench.ts') && (!only || f.includes(only)))
	.sort();

let failed = 0;
for (const file of files) {
	try {
		const mod = (await import(pathToFileURL(join(here, file)).href)) as {
			default: (report: (f: Figure) => void) => Promise<void>;
		};
		await mod.default((f) => console.log(JSON.stringify(f)));
	} catch (error) {
		failed++;
		console.error(`${file}: ${error instanceof Error ? error.stack : String(error)}`);
	}
}
process.exit(failed ? 1 : 0);
