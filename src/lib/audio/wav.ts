// A RIFF/WAVE writer for rendered audio: 16-bit integer PCM (format 1) or 32-bit float
// (format 3), interleaved channels, little-endian, canonical 44-byte header.

export interface WavOptions {
	bitDepth?: 16 | 32;
}

export function encodeWav(
	channels: ArrayLike<number>[],
	sampleRate: number,
	{ bitDepth = 16 }: WavOptions = {}
): Uint8Array {
	const channelCount = channels.length;
	const frames = channelCount ? Math.min(...channels.map((c) => c.length)) : 0;
	const bytesPerSample = bitDepth / 8;
	const dataBytes = frames * channelCount * bytesPerSample;
	const bytes = new Uint8Array(44 + dataBytes);
	const view = new DataView(bytes.buffer);
	const text = (offset: number, s: string) => {
		for (let i = 0; i < s.length; i++) bytes[offset + i] = s.charCodeAt(i);
	};
	text(0, 'RIFF');
	view.setUint32(4, 36 + dataBytes, true);
	text(8, 'WAVE');
	text(12, 'fmt ');
	view.setUint32(16, 16, true);
	view.setUint16(20, bitDepth === 32 ? 3 : 1, true);
	view.setUint16(22, channelCount, true);
	view.setUint32(24, sampleRate, true);
	view.setUint32(28, sampleRate * channelCount * bytesPerSample, true);
	view.setUint16(32, channelCount * bytesPerSample, true);
	view.setUint16(34, bitDepth, true);
	text(36, 'data');
	view.setUint32(40, dataBytes, true);
	let offset = 44;
	for (let i = 0; i < frames; i++) {
		for (let c = 0; c < channelCount; c++) {
			const v = channels[c][i];
			if (bitDepth === 32) view.setFloat32(offset, v, true);
			else {
				const clamped = Math.max(-1, Math.min(1, v));
				view.setInt16(offset, Math.round(clamped < 0 ? clamped * 32768 : clamped * 32767), true);
			}
			offset += bytesPerSample;
		}
	}
	return bytes;
}
