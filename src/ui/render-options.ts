/**
 * How the console is rendered and how its process is tuned, shared with the benchmark so that it
 * measures the real thing.
 */
import {setFlagsFromString} from 'node:v8';
import {holdYoungGeneration, stopYoungGenerationGrowth} from '../runtime/young-generation.js';

/**
 * 60 frames a second at most: a key press after a pause gets its frame at once (Ink throttles on
 * the leading and trailing edge), and a held-down key still coalesces.
 */
export const consoleRenderOptions = {exitOnCtrlC: true, maxFps: 60, onRender: holdYoungGeneration} as const;

/**
 * Old generation grows to 1.5× what survived the last full collection before the next one
 * (V8 otherwise lets it reach 3–4× while keys are pressed; what survives is about 15–20 MB).
 */
const oldGenerationGrowthPercent = 50;

/**
 * Call before Ink and React load. React's production build loads and renders faster (its
 * development checks are for us, not for users). The heap flags below are read by V8 at run time
 * (measured in the console bench: resident memory after 200 edits 140–160 MB without them,
 * 100–108 MB with them, for about 1 ms more CPU per key press). `--optimize-for-size` saved memory
 * too but doubled key-to-frame time.
 */
export function tuneProcessForConsole(): void {
	process.env['NODE_ENV'] ??= 'production';
	setFlagsFromString(`--heap-growing-percent=${oldGenerationGrowthPercent}`);
	// No growth while Ink and React load; the check after each frame (onRender) lets it grow to the
	// cap, and no further (runtime/young-generation.ts).
	stopYoungGenerationGrowth();
}
