import { describe, expect, it } from 'vitest';
import { encodeWav } from '$lib/audio/wav';
import { fileStem, wavSeconds } from '$lib/replay/download';

describe('downloads', () => {
	it('makes a file name of letters, digits, dots and dashes', () => {
		expect(fileStem('Stutter chord · take 3!')).toBe('Stutter-chord-take-3');
		expect(fileStem('···')).toBe('session');
	});

	it('reads the length of a rendered WAV from its header', () => {
		const second = new Float32Array(48000);
		expect(wavSeconds(encodeWav([second, second], 48000))).toBe(1);
		expect(wavSeconds(encodeWav([second], 24000, { bitDepth: 32 }))).toBe(2);
	});
});
