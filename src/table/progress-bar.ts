/**
 * A one-line progress bar for long sweeps. It writes only when the stream is a terminal (isTTY),
 * and only once the work has run for `delayMs` (so sweeps under about a second stay silent); it
 * redraws at most every `intervalMs` and erases itself when done. Piped or redirected: silent.
 *
 * The sweep is synchronous, so updates come from inside it; terminal writes on Linux and macOS are
 * synchronous too, so the bar shows while the sweep runs.
 */

/** The parts of a stream the bar uses (process.stderr fits). */
export interface ProgressStream {
	readonly isTTY?: boolean;
	readonly columns?: number;
	write(text: string): unknown;
}

export interface ProgressOptions {
	/** Text before the bar. @default 'rows' */
	readonly label?: string;
	/** Silent for this long after the bar is created, ms. @default 1000 */
	readonly delayMs?: number;
	/** Least time between redraws, ms. @default 100 */
	readonly intervalMs?: number;
	/** Clock in ms (tests pass a fake). @default performance.now */
	readonly now?: () => number;
}

export interface ProgressBar {
	update(done: number, total: number): void;
	/** Erases the bar if it was drawn. */
	finish(): void;
	/** Whether the bar is on screen now. */
	readonly drawn: boolean;
}

export function createProgressBar(stream: ProgressStream, options: ProgressOptions = {}): ProgressBar {
	const label = options.label ?? 'rows';
	const delayMs = options.delayMs ?? 1000;
	const intervalMs = options.intervalMs ?? 100;
	const now = options.now ?? (() => performance.now());
	const active = stream.isTTY === true;
	const start = now();
	let last = -Infinity;
	let drawn = false;

	return {
		get drawn() {
			return drawn;
		},
		update(done: number, total: number) {
			if (!active || total <= 0) return;
			const t = now();
			if (t - start < delayMs || (t - last < intervalMs && done < total)) return;
			last = t;
			const fraction = Math.min(1, Math.max(0, done / total));
			const text = `${label} ${done}/${total} ${String(Math.floor(fraction * 100)).padStart(3)} %`;
			const columns = stream.columns && stream.columns > 0 ? stream.columns : 80;
			const barWidth = Math.max(10, Math.min(40, columns - text.length - 4));
			const filled = Math.round(fraction * barWidth);
			stream.write(`\r[${'#'.repeat(filled)}${'.'.repeat(barWidth - filled)}] ${text}`);
			drawn = true;
		},
		finish() {
			if (drawn) stream.write('\r\u001b[2K');
			drawn = false;
		},
	};
}
