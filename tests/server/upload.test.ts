// Uploads stream under the app's own limits, their kind read from their bytes; JSON bodies too.
import { readJson, Refusal } from '$lib/server/http';
import { sniffAudio } from '$lib/server/sniff';
import { receiveFormUpload, receiveUpload } from '$lib/server/upload';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';

let dir: string;
beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-upload-'));
	process.env.UPLOADS_DIR = join(dir, 'uploads');
});
afterAll(() => {
	delete process.env.UPLOADS_DIR;
	rmSync(dir, { recursive: true, force: true });
});

const webm = readFileSync('tests/fixtures/take.webm'); // 1.5 s recorded by Chromium's MediaRecorder (Opus in WebM)
const png = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c489', 'hex'); // PNG signature + IHDR
function wav(samples = 22_050): Uint8Array {
	const file = new wavefile.WaveFile();
	file.fromScratch(1, 22_050, '16', new Int16Array(samples).fill(900));
	return file.toBuffer();
}

/** A body that counts what was pulled from it; `endless` keeps producing 64 KiB pieces. */
function counted(bytes: Uint8Array | 'endless', headers: Record<string, string> = {}) {
	const meter = { pulled: 0 };
	let offset = 0;
	const body = new ReadableStream<Uint8Array>({
		pull(controller) {
			const piece = bytes === 'endless' ? new Uint8Array(65_536).fill(7) : bytes.subarray(offset, offset + 65_536);
			offset += piece.length;
			if (!piece.length) return controller.close();
			meter.pulled += piece.length;
			controller.enqueue(piece.slice());
		}
	});
	const request = new Request('http://localhost/upload', {
		method: 'PUT',
		headers: { 'content-type': 'application/octet-stream', ...headers },
		body,
		duplex: 'half'
	} as RequestInit);
	return { request, meter };
}

const rules = (limit: number) => ({
	limit,
	tooLarge: 'too large',
	sniff: sniffAudio,
	wrongKind: () => 'not audio'
});
const incoming = () => readdirSync(join(dir, 'uploads', '.incoming'));

async function refusal(promise: Promise<unknown>): Promise<Refusal> {
	const error = await promise.then(
		() => null,
		(e) => e
	);
	expect(error).toBeInstanceOf(Refusal);
	return error as Refusal;
}

describe('the kind of an upload is read from its bytes', () => {
	it('knows WebM/Opus, WAV, Ogg and MP3 whatever their name or declared type', async () => {
		expect(await sniffAudio(webm.subarray(0, 4100))).toEqual({ mime: 'audio/webm', ext: 'webm' });
		expect(await sniffAudio(wav())).toEqual({ mime: 'audio/wav', ext: 'wav' });
		// Ogg page header "OggS" with an Opus identification header (RFC 3533, RFC 7845 §5.1)
		const ogg = Buffer.concat([
			Buffer.from('OggS\0\x02', 'latin1'),
			Buffer.alloc(22),
			Buffer.from('OpusHead'),
			Buffer.alloc(11)
		]);
		expect((await sniffAudio(ogg))?.mime).toBe('audio/ogg');
		// An ID3v2.4 tag header (id3.org, ID3 tag version 2.4.0 §3.1) in front of MPEG audio
		const mp3 = Buffer.concat([
			Buffer.from('ID3\x04\0\0\0\0\0\0', 'latin1'),
			Buffer.from([0xff, 0xfb, 0x90, 0x64]),
			Buffer.alloc(400)
		]);
		expect((await sniffAudio(mp3))?.mime).toBe('audio/mpeg');
		expect(await sniffAudio(png)).toBeNull();
		expect(await sniffAudio(Buffer.from('{"version":1}'))).toBeNull();
	});

	it('stores a WAV sent as text/plain as audio/wav', async () => {
		const bytes = wav();
		const { request } = counted(bytes, { 'content-type': 'text/plain' });
		const got = await receiveUpload(request, rules(1 << 20));
		expect(got.kind.mime).toBe('audio/wav');
		expect(got.bytes).toBe(bytes.length);
		expect(readFileSync(got.path).equals(Buffer.from(bytes))).toBe(true);
		rmSync(got.path);
	});

	it('refuses a picture sent as audio/webm with 415 after its first bytes, keeping nothing', async () => {
		const bytes = Buffer.concat([png, Buffer.alloc(2 << 20)]);
		const { request, meter } = counted(bytes, { 'content-type': 'audio/webm' });
		const e = await refusal(receiveUpload(request, rules(10 << 20)));
		expect(e.status).toBe(415);
		expect(meter.pulled).toBeLessThan(bytes.length);
		expect(incoming()).toEqual([]);
	});
});

describe('the size of an upload is counted while it streams', () => {
	it('refuses a declared length over the limit before reading the body', async () => {
		// An endless body: were it read before refusing, this would never answer.
		const { request } = counted('endless', { 'content-length': String(5 << 20) });
		const e = await refusal(receiveUpload(request, rules(1 << 20)));
		expect(e.status).toBe(413);
		expect(incoming()).toEqual([]);
	});

	it('refuses an endless body without a declared length as soon as it crosses the limit', async () => {
		const head = wav(4096);
		const { request, meter } = counted('endless');
		// An endless body that starts like audio, so only its size refuses it.
		const stream = request.body!.pipeThrough(
			new TransformStream<Uint8Array, Uint8Array>({
				start: (c) => c.enqueue(head.slice()),
				transform: (chunk, c) => c.enqueue(chunk)
			})
		);
		const upload = new Request('http://localhost/upload', {
			method: 'PUT',
			body: stream,
			duplex: 'half'
		} as RequestInit);
		let pulledAtRefusal = -1;
		const e = await refusal(
			receiveUpload(upload, rules(3 << 20)).finally(() => {
				pulledAtRefusal = meter.pulled;
			})
		);
		expect(e.status).toBe(413);
		expect(pulledAtRefusal).toBeLessThan((3 << 20) + 4 * 65_536);
		expect(incoming()).toEqual([]);
	});

	it('accepts a body of exactly the limit and an empty body is refused', async () => {
		const bytes = wav(100_000);
		const got = await receiveUpload(counted(bytes).request, rules(bytes.length));
		expect(got.bytes).toBe(bytes.length);
		rmSync(got.path);
		expect(existsSync(got.path)).toBe(false);
		const e = await refusal(receiveUpload(counted(new Uint8Array(0)).request, rules(1000)));
		expect(e.status).toBe(400);
	});
});

describe('JSON bodies', () => {
	const Doc = z.object({ name: z.string() });
	const post = (body: BodyInit, headers: Record<string, string> = {}) =>
		new Request('http://localhost/api', { method: 'POST', body, headers, duplex: 'half' } as RequestInit);

	it('reads a document under the limit', async () => {
		expect(await readJson(post(JSON.stringify({ name: 'row' })), Doc)).toEqual({ name: 'row' });
	});

	it('refuses a document over the limit with 413, counting bytes while it streams', async () => {
		const big = JSON.stringify({ name: 'é'.repeat(600_000) }); // 1.2 MB in UTF-8, 600 k characters
		const e = await refusal(readJson(post(counted(Buffer.from(big)).request.body!), Doc, 1 << 20));
		expect(e.status).toBe(413);
		expect(e.message).toMatch(/too large \(over 1 MiB\)/);
	});

	it('refuses a file that is no JSON with 415 and broken JSON with 400', async () => {
		expect((await refusal(readJson(post(webm), Doc))).status).toBe(415);
		expect((await refusal(readJson(post('{"name": '), Doc))).status).toBe(400);
	});
});

describe('a form with a file streams the file to disk', () => {
	/** A browser's multipart form (the Fetch standard's FormData encoding), as a request body. */
	function form(parts: Record<string, string | { name: string; bytes: Uint8Array; type?: string }>) {
		const data = new FormData();
		for (const [key, value] of Object.entries(parts))
			if (typeof value === 'string') data.append(key, value);
			else
				data.append(
					key,
					new Blob([Uint8Array.from(value.bytes)], { type: value.type ?? 'application/octet-stream' }),
					value.name
				);
		return new Request('http://localhost/form', { method: 'POST', body: data });
	}

	it('reads the text fields and writes the file byte for byte, its kind from its bytes', async () => {
		const bytes = wav(200_000); // 400 kB, several pieces of the stream
		const got = await receiveFormUpload(
			form({ rehearsalId: 'take-1', audio: { name: 'take.webm', bytes, type: 'text/plain' } }),
			'audio',
			rules(1 << 20)
		);
		expect(got.fields).toEqual({ rehearsalId: 'take-1' });
		expect(got.file).toMatchObject({ name: 'take.webm', bytes: bytes.length, kind: { mime: 'audio/wav' } });
		expect(readFileSync(got.file!.path).equals(Buffer.from(bytes))).toBe(true);
		rmSync(got.file!.path);
	});

	it('answers no file when none was chosen (an empty part without a name), and refuses a chosen empty file', async () => {
		const none = await receiveFormUpload(
			form({ rehearsalId: 'take-1', audio: { name: '', bytes: new Uint8Array(0) } }),
			'audio',
			rules(1000)
		);
		expect(none).toEqual({ fields: { rehearsalId: 'take-1' }, file: null });
		const e = await refusal(
			receiveFormUpload(form({ audio: { name: 'silence.wav', bytes: new Uint8Array(0) } }), 'audio', rules(1000))
		);
		expect(e.status).toBe(400);
		expect(e.message).toContain('“silence.wav” is empty');
		expect(incoming()).toEqual([]);
	});

	it('refuses a file over the limit (413) and one that is no audio (415), keeping nothing', async () => {
		const big = await refusal(
			receiveFormUpload(form({ audio: { name: 'long.wav', bytes: wav(300_000) } }), 'audio', rules(100_000))
		);
		expect(big.status).toBe(413);
		const picture = await refusal(
			receiveFormUpload(form({ audio: { name: 'take.webm', bytes: png, type: 'audio/webm' } }), 'audio', rules(1 << 20))
		);
		expect(picture.status).toBe(415);
		expect(picture.message).toBe('not audio');
		expect(incoming()).toEqual([]);
	});

	it('refuses a body that is not a multipart form with 415', async () => {
		const request = new Request('http://localhost/form', {
			method: 'POST',
			body: 'rehearsalId=take-1',
			headers: { 'content-type': 'application/x-www-form-urlencoded' }
		});
		expect((await refusal(receiveFormUpload(request, 'audio', rules(1000)))).status).toBe(415);
	});
});
