import type { S3Settings } from '$lib/server/storage';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import S3rver from 's3rver';

/** An S3-compatible fake (s3rver) on a free loopback port with one bucket; `close()` removes it. */
export async function startS3Fake(bucket = 'padproof') {
	const directory = mkdtempSync(join(tmpdir(), 'padproof-s3-'));
	const server = new S3rver({
		port: 0,
		address: '127.0.0.1',
		silent: true,
		directory,
		configureBuckets: [{ name: bucket }]
	});
	const { port } = await server.run();
	const settings: S3Settings = {
		bucket,
		endpoint: `http://127.0.0.1:${port}`,
		region: 'us-east-1',
		// s3rver's fixed credentials (its README).
		accessKeyId: 'S3RVER',
		secretAccessKey: 'S3RVER',
		forcePathStyle: true
	};
	return {
		settings,
		async close() {
			await server.close();
			rmSync(directory, { recursive: true, force: true });
		}
	};
}
