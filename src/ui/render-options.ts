/**
 * How the console is rendered and how its process is tuned, shared with the benchmark so that it
 * measures the real thing.
 */
import {getHeapSpaceStatistics, setFlagsFromString} from 'node:v8';

/**
 * 60 frames a second at most: a key press after a pause gets its frame at once (Ink throttles on
 * the leading and trailing edge), and a held-down key still coalesces.
 */
export const consoleRenderOptions = {exitOnCtrlC: true, maxFps: 60, onRender: holdYoungGeneration} as const;

/**
 * Young generation (both semi-spaces), bytes, that the console lets V8 grow to. Every frame leaves
 * several MB of short-lived garbage (Ink rebuilds and re-encodes all 100×30 cells), so by default
 * V8 grows it to 2 × 16 MB, all of it resident. 2 × 8 MB measured the better trade: smaller
 * semi-spaces promote more of a frame's work to the old generation, and a 2 × 1 MB young generation
 * made a key press a third dearer; 2 × 4 MB saved 6 MB more for about 1 ms more per press.
 */
const youngGenerationCapBytes = 16 * 1024 * 1024;

/**
 * Old generation grows to 1.5× what survived the last full collection before the next one
 * (V8 otherwise lets it reach 3–4× while keys are pressed; what survives is about 15–20 MB).
 */
const oldGenerationGrowthPercent = 50;

let isYoungHeld = false;

/**
 * Holds the young generation at the cap. Its maximum can only be set when the process starts
 * (`--max-semi-space-size` given later changes nothing, as measured), but the growth factor is
 * read whenever V8 grows the space: 1 (no growth) once the cap is reached, the default 2 below it
 * (V8 shrinks the space after a quiet spell; typing lets it grow back to the cap). Checked after
 * every frame (Ink's onRender): the space grows only while a key's work allocates, and an idle
 * console wakes for nothing.
 */
function holdYoungGeneration(): void {
	const young = getHeapSpaceStatistics().find((s) => s.space_name === 'new_space')?.space_size ?? 0;
	const shouldHold = young >= youngGenerationCapBytes;
	if (shouldHold === isYoungHeld) return;
	setFlagsFromString(`--semi-space-growth-factor=${shouldHold ? 1 : 2}`);
	isYoungHeld = shouldHold;
}

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
	// No growth while Ink and React load; the first frame's check lets it grow to the cap.
	setFlagsFromString('--semi-space-growth-factor=1');
	isYoungHeld = true;
}
