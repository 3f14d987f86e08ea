// Where uploaded files live: one interface, two stores. Local disk under UPLOADS_DIR by default;
// an S3-compatible bucket through @aws-sdk/client-s3 when S3_BUCKET is set, so several app
// instances can share the files. Names are ours (never the client's), so a request can't reach
// outside the store. A file is written whole to a temporary name first and only then put in
// under its name, so a reader never sees half a file.
import { createReadStream } from 'node:fs';
import { mkdirSync } from 'node:fs';
import { open, readdir, rename, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { s3Settings, uploadsDir } from './config';

export interface StoredFile {
	stream: ReadableStream<Uint8Array>;
	size: number;
}

export interface UploadStore {
	readonly kind: 'disk' | 's3';
	/** Moves a finished temporary file in under `name` (all or nothing); the temporary file is gone after. */
	put(tempPath: string, name: string, contentType: string): Promise<void>;
	get(name: string): Promise<StoredFile | null>;
	remove(name: string): Promise<void>;
	/** Every stored name (for checks and clean-ups). */
	list(): Promise<string[]>;
}

const NAME = /^[\w-][\w.-]*$/;

function checkName(name: string): string {
	if (!NAME.test(name)) throw new Error(`Not a storage name: ${JSON.stringify(name)}`);
	return name;
}

/** Temporary files of uploads in progress (on local disk, beside the disk store for atomic renames). */
export function incomingDir(): string {
	const dir = join(uploadsDir(), '.incoming');
	mkdirSync(dir, { recursive: true });
	return dir;
}

/** Removes temporary files older than `maxAgeMs` left by a stopped process. */
export async function sweepIncoming(maxAgeMs = 24 * 3600_000): Promise<number> {
	const dir = incomingDir();
	let removed = 0;
	for (const name of await readdir(dir)) {
		const path = join(dir, name);
		const info = await stat(path).catch(() => null);
		if (info && Date.now() - info.mtimeMs > maxAgeMs) {
			await rm(path, { force: true });
			removed++;
		}
	}
	return removed;
}

export function diskStore(dir: string): UploadStore {
	mkdirSync(dir, { recursive: true });
	return {
		kind: 'disk',
		async put(tempPath, name) {
			// rename(2) replaces atomically within one file system; the temporary folder is inside `dir`.
			await rename(tempPath, join(dir, checkName(name)));
		},
		async get(name) {
			if (!NAME.test(name)) return null;
			// Open first, then measure the open file: a replacement meanwhile can't mix sizes and bytes.
			const handle = await open(join(dir, name), 'r').catch(() => null);
			if (!handle) return null;
			const info = await handle.stat();
			if (!info.isFile()) {
				await handle.close();
				return null;
			}
			return { stream: Readable.toWeb(handle.createReadStream()) as ReadableStream<Uint8Array>, size: info.size };
		},
		async remove(name) {
			if (NAME.test(name)) await rm(join(dir, name), { force: true });
		},
		async list() {
			const entries = await readdir(dir, { withFileTypes: true });
			return entries.filter((e) => e.isFile() && NAME.test(e.name)).map((e) => e.name);
		}
	};
}

export type S3Settings = NonNullable<ReturnType<typeof s3Settings>>;

export function s3Store(settings: S3Settings): UploadStore {
	// The SDK is loaded only when a bucket is configured.
	const sdk = import('@aws-sdk/client-s3');
	const client = sdk.then(
		({ S3Client }) =>
			new S3Client({
				endpoint: settings.endpoint,
				region: settings.region,
				forcePathStyle: settings.forcePathStyle,
				// Checksums only where S3 requires them: the SDK's default streams bodies in aws-chunked
				// framing, which several S3-compatible stores (the s3rver fake among them) store verbatim.
				requestChecksumCalculation: 'WHEN_REQUIRED',
				responseChecksumValidation: 'WHEN_REQUIRED',
				credentials:
					settings.accessKeyId && settings.secretAccessKey
						? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey }
						: undefined
			})
	);
	const Bucket = settings.bucket;
	return {
		kind: 's3',
		async put(tempPath, name, contentType) {
			const { PutObjectCommand } = await sdk;
			try {
				const { size } = await stat(tempPath);
				// One PUT is all or nothing: the object appears only once the whole body arrived.
				await (
					await client
				).send(
					new PutObjectCommand({
						Bucket,
						Key: checkName(name),
						Body: createReadStream(tempPath),
						ContentLength: size,
						ContentType: contentType
					})
				);
			} finally {
				await rm(tempPath, { force: true });
			}
		},
		async get(name) {
			if (!NAME.test(name)) return null;
			const { GetObjectCommand } = await sdk;
			try {
				const out = await (await client).send(new GetObjectCommand({ Bucket, Key: name }));
				if (!out.Body) return null;
				return {
					stream: out.Body.transformToWebStream() as ReadableStream<Uint8Array>,
					size: Number(out.ContentLength)
				};
			} catch (e) {
				if ((e as { name?: string }).name === 'NoSuchKey') return null;
				throw e;
			}
		},
		async remove(name) {
			if (!NAME.test(name)) return;
			const { DeleteObjectCommand } = await sdk;
			await (await client).send(new DeleteObjectCommand({ Bucket, Key: name }));
		},
		async list() {
			const { ListObjectsV2Command } = await sdk;
			const names: string[] = [];
			let ContinuationToken: string | undefined;
			do {
				const page = await (await client).send(new ListObjectsV2Command({ Bucket, ContinuationToken }));
				for (const item of page.Contents ?? []) if (item.Key) names.push(item.Key);
				ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
			} while (ContinuationToken);
			return names;
		}
	};
}

let current: { key: string; store: UploadStore } | null = null;

/** The store the settings name (an S3 bucket when S3_BUCKET is set, else local disk). */
export function uploadStore(): UploadStore {
	const s3 = s3Settings();
	const key = s3 ? `s3:${JSON.stringify(s3)}` : `disk:${uploadsDir()}`;
	if (current?.key !== key) current = { key, store: s3 ? s3Store(s3) : diskStore(uploadsDir()) };
	return current.store;
}
