// Saves bytes made in the browser (a MIDI file, a WAV render) as a download.

export function saveBytes(bytes: Uint8Array, name: string, type: string): void {
	const url = URL.createObjectURL(new Blob([bytes as BlobPart], { type }));
	const link = Object.assign(document.createElement('a'), { href: url, download: name });
	document.body.append(link);
	link.click();
	link.remove();
	setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** A file name from a session name: letters, digits, dots and dashes only. */
export function fileStem(name: string): string {
	return name.replace(/[^\w.-]+/g, '-').replace(/^-+|-+$/g, '') || 'session';
}

/** Seconds of sound in a PCM WAV file with the plain 44-byte header. */
export function wavSeconds(bytes: Uint8Array): number {
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	const rate = view.getUint32(24, true);
	const channels = view.getUint16(22, true);
	const bytesPerSample = view.getUint16(34, true) / 8;
	return (bytes.byteLength - 44) / (rate * channels * bytesPerSample);
}
