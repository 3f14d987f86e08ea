import { describe, expect, it } from 'vitest';
import wavefile from 'wavefile';
import { encodeWav } from '../../src/lib/audio/wav';

const read = (bytes: Uint8Array) => new wavefile.WaveFile(bytes); // an independent reader from npm

describe('encodeWav', () => {
	it('writes a canonical 44-byte RIFF header (RIFF/WAVE, fmt chunk of 16, data chunk)', () => {
		const bytes = encodeWav([new Float32Array(10), new Float32Array(10)], 48000);
		const text = (o: number) => String.fromCharCode(...bytes.subarray(o, o + 4));
		const view = new DataView(bytes.buffer);
		expect([text(0), text(8), text(12), text(36)]).toEqual(['RIFF', 'WAVE', 'fmt ', 'data']);
		expect(view.getUint32(4, true)).toBe(bytes.length - 8);
		expect(view.getUint32(28, true)).toBe(48000 * 2 * 2); // byte rate = rate × channels × bytes
		expect(view.getUint32(40, true)).toBe(10 * 2 * 2);
	});

	it('reads back in an independent parser with the same format and samples (16-bit)', () => {
		const left = Float32Array.from([0, 0.5, -0.5, 1, -1, 2]);
		const right = Float32Array.from([0.25, -0.25, 0, 0, 0, -2]);
		const wav = read(encodeWav([left, right], 44100));
		expect(wav.fmt).toMatchObject({ audioFormat: 1, numChannels: 2, sampleRate: 44100, bitsPerSample: 16 });
		const [l, r] = wav.getSamples(false, Int16Array) as unknown as Int16Array[];
		// 16-bit PCM: full scale is −32768..32767; values beyond ±1 clip.
		expect(Array.from(l)).toEqual([0, 16384, -16384, 32767, -32768, 32767]);
		expect(Array.from(r)).toEqual([8192, -8192, 0, 0, 0, -32768]);
	});

	it('writes 32-bit float (format 3) exactly', () => {
		const samples = Float32Array.from([0.123, -0.987, 0.5]);
		const wav = read(encodeWav([samples], 48000, { bitDepth: 32 }));
		expect(wav.fmt).toMatchObject({ audioFormat: 3, numChannels: 1, bitsPerSample: 32 });
		expect(Array.from(wav.getSamples(false, Float32Array) as unknown as Float32Array)).toEqual(Array.from(samples));
	});
});
