// What a file is, read from its first bytes (its "magic"), never from its name or a header the
// client chose. file-type (npm) knows the signatures: EBML for WebM, "OggS" for Ogg, RIFF/WAVE,
// the ISO base media "ftyp" box for MP4/M4A, ID3 or an MPEG frame sync for MP3.
import { fileTypeFromBuffer } from 'file-type';

/** file-type reads at most this many bytes to decide (its documented default sample size). */
export const SNIFF_BYTES = 4100;

export interface AudioKind {
	mime: string;
	ext: string;
}

const AUDIO: Record<string, AudioKind> = {
	webm: { mime: 'audio/webm', ext: 'webm' },
	ogg: { mime: 'audio/ogg', ext: 'ogg' },
	oga: { mime: 'audio/ogg', ext: 'ogg' },
	opus: { mime: 'audio/ogg', ext: 'ogg' },
	wav: { mime: 'audio/wav', ext: 'wav' },
	m4a: { mime: 'audio/mp4', ext: 'm4a' },
	mp4: { mime: 'audio/mp4', ext: 'm4a' },
	mp3: { mime: 'audio/mpeg', ext: 'mp3' }
};

/** The audio kind of a file from its first bytes, or null when it is no audio format Padproof keeps. */
export async function sniffAudio(head: Uint8Array): Promise<AudioKind | null> {
	const found = await fileTypeFromBuffer(head).catch(() => undefined);
	return (found && AUDIO[found.ext]) ?? null;
}

/** What a refused file looks like, for the message: "a PNG image", "a ZIP archive", "text". */
export async function describeContent(head: Uint8Array): Promise<string> {
	const found = await fileTypeFromBuffer(head).catch(() => undefined);
	if (found) return `a .${found.ext} file (${found.mime})`;
	return head.length === 0 ? 'empty' : 'of no audio format';
}
