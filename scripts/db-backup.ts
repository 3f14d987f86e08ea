// `npm run db:backup`: a consistent copy of the SQLite database under $PADPROOF_DATA_DIR/backups
// (or BACKUPS_DIR), made while the app keeps running.
import { ConfigError } from '../src/lib/server/config';
import { backupDatabase } from '../src/lib/server/db/backup';

try {
	const file = await backupDatabase();
	console.log(`Backup written: ${file}`);
} catch (e) {
	console.error(e instanceof ConfigError ? e.message : `The backup failed: ${(e as Error).message}`);
	process.exit(1);
}
