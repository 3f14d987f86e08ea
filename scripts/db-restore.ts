// `npm run db:restore -- <backup file>`: puts a backup in place of the database. Stop the app
// first; the current database is kept beside it as <name>.before-restore-<time>.
import { ConfigError, databaseUrl } from '../src/lib/server/config';
import { restoreDatabase } from '../src/lib/server/db/backup';

const file = process.argv[2];
if (!file) {
	console.error('Usage: npm run db:restore -- <backup file>   (stop Padproof first)');
	process.exit(2);
}
try {
	const { kept } = await restoreDatabase(file);
	console.log(`Restored ${file} to ${databaseUrl()}.`);
	if (kept) console.log(`The database it replaced is kept at ${kept}.`);
} catch (e) {
	console.error(e instanceof ConfigError ? e.message : `The restore failed: ${(e as Error).message}`);
	process.exit(1);
}
