// Loads the audio layer into a bare page for the benchmark: no app, no sign-in.
import { installSoundsHook } from '$lib/audio/hook';
import { measureLive } from './live';

installSoundsHook(window as unknown as Parameters<typeof installSoundsHook>[0]);
(window as unknown as { padproofLive: typeof measureLive }).padproofLive = measureLive;
document.title = 'ready';
