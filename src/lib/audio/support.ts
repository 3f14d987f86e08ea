// Whether this browser can make sound at all, with a message a performer can act on.

export function webAudioProblem(target: object | undefined = globalThis): string | null {
	const scope = target as { AudioContext?: unknown; webkitAudioContext?: unknown; OfflineAudioContext?: unknown };
	if (!scope.AudioContext && !scope.webkitAudioContext) {
		return 'This browser has no Web Audio, so Padproof cannot play sound here. Pads, replay and the doctor still work. For sound, use a current Chromium, Firefox or Safari.';
	}
	if (!scope.OfflineAudioContext) {
		return 'This browser cannot render audio offline, so sound files cannot be exported here. Live sound still works.';
	}
	return null;
}
