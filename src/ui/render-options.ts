/**
 * How the console is rendered and how its process is tuned, shared with the benchmark so that it
 * measures the real thing.
 */
import {setFlagsFromString} from 'node:v8';

/**
 * 60 frames a second at most: a key press after a pause gets its frame at once (Ink throttles on
 * the leading and trailing edge), and a held-down key still coalesces.
 */
export const consoleRenderOptions = {exitOnCtrlC: true, maxFps: 60} as const;

/**
 * Call before Ink and React load. React's production build loads and renders faster (its
 * development checks are for us, not for users). The console's garbage is many short-lived frame
 * strings, for which V8 by default lets the young generation grow to tens of MB of resident
 * memory; a 1 MB semi-space keeps it small and measured no slower per key press (the flag takes
 * effect at run time). `--optimize-for-size` saved more memory but doubled key-to-frame time.
 */
export function tuneProcessForConsole(): void {
	process.env['NODE_ENV'] ??= 'production';
	setFlagsFromString('--max-semi-space-size=1');
}
