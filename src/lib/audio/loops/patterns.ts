// Demo loops: our own patterns, 16 steps a bar. Drum lanes are strings ('x' hit, 'X' accent,
// '.' rest); bass and chord notes are [step, MIDI note(s), length in steps]. Each loop has the
// tempo it was written at, but every deck plays at the rig tempo.

export type DrumLane = 'kick' | 'snare' | 'clap' | 'hat' | 'open';

export interface DemoLoop {
	id: string;
	name: string;
	style: string;
	bpm: number;
	bars: 1 | 2;
	drums: Partial<Record<DrumLane, string>>;
	bass: [step: number, note: number, length: number][];
	chords: [step: number, notes: number[], length: number][];
}

export const DEMO_LOOPS: readonly DemoLoop[] = [
	{
		id: 'slow-honey',
		name: 'Slow Honey',
		style: 'downtempo',
		bpm: 85,
		bars: 2,
		drums: {
			kick: 'x......x..x.....x.........x.....',
			snare: '....x.......x.......x.......x...',
			hat: 'x.x.x.x.x.x.x.x.x.x.x.x.x.x.x.xx'
		},
		bass: [
			[0, 38, 6],
			[7, 38, 2],
			[10, 41, 4],
			[16, 36, 6],
			[26, 43, 4]
		],
		chords: [
			[0, [62, 65, 69, 72], 14],
			[16, [60, 64, 67, 71], 14]
		]
	},
	{
		id: 'porch-light',
		name: 'Porch Light',
		style: 'boom bap',
		bpm: 92,
		bars: 2,
		drums: {
			kick: 'X.....x...x.....X..x......x.....',
			snare: '....X.......X.......X.......X..x',
			hat: 'x.x.x.x.x.x.x.x.x.x.x.x.x.x.x.x.',
			open: '..............x...............x.'
		},
		bass: [
			[0, 40, 3],
			[6, 40, 2],
			[10, 43, 3],
			[16, 45, 3],
			[19, 43, 2],
			[26, 38, 4]
		],
		chords: [
			[0, [64, 67, 71], 6],
			[10, [62, 67, 69], 6],
			[16, [60, 64, 69], 8],
			[26, [62, 66, 69], 6]
		]
	},
	{
		id: 'brass-kite',
		name: 'Brass Kite',
		style: 'funk',
		bpm: 108,
		bars: 1,
		drums: {
			kick: 'X..x..x...X..x..',
			snare: '....X..x.x..X...',
			hat: 'xxXxxxXxxxXxxxXx'
		},
		bass: [
			[0, 36, 1],
			[3, 36, 1],
			[6, 48, 1],
			[7, 46, 1],
			[10, 43, 2],
			[13, 39, 1],
			[14, 41, 2]
		],
		chords: [
			[2, [60, 63, 67, 70], 1],
			[6, [60, 63, 67, 70], 1],
			[11, [58, 62, 65, 69], 2]
		]
	},
	{
		id: 'glass-steps',
		name: 'Glass Steps',
		style: 'house',
		bpm: 124,
		bars: 1,
		drums: {
			kick: 'X...X...X...X...',
			clap: '....x.......x...',
			hat: '..x...x...x...x.',
			open: '..x...x...x...x.'
		},
		bass: [
			[2, 41, 1],
			[6, 41, 1],
			[10, 44, 1],
			[14, 39, 2]
		],
		chords: [
			[3, [65, 68, 72, 75], 2],
			[10, [63, 67, 70, 74], 3]
		]
	},
	{
		id: 'night-bus',
		name: 'Night Bus',
		style: 'techno',
		bpm: 132,
		bars: 1,
		drums: {
			kick: 'X...X...X...X...',
			hat: 'x.xxx.xxx.xxx.xx',
			clap: '........x.......'
		},
		bass: [
			[1, 33, 1],
			[3, 33, 1],
			[5, 45, 1],
			[7, 33, 1],
			[9, 33, 1],
			[11, 36, 1],
			[13, 33, 1],
			[15, 43, 1]
		],
		chords: [
			[0, [57, 60, 64], 1],
			[7, [57, 60, 65], 1]
		]
	},
	{
		id: 'harbour-wobble',
		name: 'Harbour Wobble',
		style: 'halftime',
		bpm: 140,
		bars: 2,
		drums: {
			kick: 'X.........x.....X.....x...x.....',
			snare: '........X...............X.......',
			hat: 'x...x...x.x.x...x...x...x.x.x.xx'
		},
		bass: [
			[0, 29, 8],
			[10, 32, 4],
			[16, 27, 6],
			[22, 29, 8]
		],
		chords: [
			[0, [53, 56, 60], 16],
			[16, [51, 55, 58], 16]
		]
	},
	{
		id: 'coil-run',
		name: 'Coil Run',
		style: 'drum and bass',
		bpm: 174,
		bars: 2,
		drums: {
			kick: 'X.........X.....X.X.......x.....',
			snare: '....X.......X.......X.......X..x',
			hat: 'x.x.x.x.x.x.x.x.x.x.x.x.x.x.x.x.',
			open: '..............x...............x.'
		},
		bass: [
			[0, 31, 10],
			[10, 34, 6],
			[16, 29, 10],
			[26, 27, 6]
		],
		chords: [[0, [67, 70, 74], 32]]
	}
];

export function findLoop(id: string): DemoLoop {
	const loop = DEMO_LOOPS.find((l) => l.id === id);
	if (!loop) throw new Error(`No demo loop "${id}"`);
	return loop;
}
