// Loads the audio layer into a bare page for the benchmark: no app, no sign-in.
import { installSoundsHook } from '$lib/audio/hook';

installSoundsHook(window as unknown as Parameters<typeof installSoundsHook>[0]);
document.title = 'ready';
