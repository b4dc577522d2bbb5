/** Runs a command in a pseudo-terminal (`script -qfc`, util-linux) of 100×30 and reads its memory from /proc. */
import {spawn} from 'node:child_process';
import {readFileSync} from 'node:fs';
import {performance} from 'node:perf_hooks';

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

export interface PtyRun {
	/** ms from spawn to the marker (or to exit when no marker is awaited). */
	readonly ms: number;
	/** Resident set at the first frame and after the keys, MB; highest resident set (VmHWM), MB. */
	readonly firstMb?: number;
	readonly editedMb?: number;
	readonly peakMb?: number;
}

function childrenOf(pid: number): number[] {
	try {
		return readFileSync(`/proc/${pid}/task/${pid}/children`, 'utf8').trim().split(/\s+/).filter(Boolean).map(Number);
	} catch {
		return [];
	}
}

function memoryOf(pid: number): {rssMb: number; peakMb: number} | undefined {
	try {
		const status = readFileSync(`/proc/${pid}/status`, 'utf8');
		const kb = (name: string) => Number(new RegExp(`^${name}:\\s+(\\d+) kB`, 'm').exec(status)?.[1] ?? NaN);
		return {rssMb: kb('VmRSS') / 1024, peakMb: kb('VmHWM') / 1024};
	} catch {
		return undefined;
	}
}

export interface PtyOptions {
	/** Text that marks the first frame; without it the run lasts until the command exits. */
	readonly marker?: string;
	/** Keys typed after the first frame, `gapMs` apart, before memory is read and Ctrl+C sent. */
	readonly keys?: readonly string[];
	readonly gapMs?: number;
}

export function inPty(command: string, env: NodeJS.ProcessEnv, o: PtyOptions = {}): Promise<PtyRun> {
	const {marker, keys = [], gapMs = 30} = o;
	return new Promise((resolve, reject) => {
		const t0 = performance.now();
		const child = spawn('script', ['-qfc', `stty cols 100 rows 30 2>/dev/null; exec ${command}`, '/dev/null'], {
			env,
			stdio: ['pipe', 'pipe', 'pipe'],
		});
		let out = '';
		let seenAt: number | undefined;
		const timer = setTimeout(() => {
			child.kill('SIGKILL');
			reject(new Error(`no ${marker ?? 'exit'} within 60 s; output so far: ${JSON.stringify(out.slice(-300))}`));
		}, 60_000);
		child.on('error', reject);
		child.stdout.on('data', async (chunk: Buffer) => {
			if (seenAt !== undefined) return;
			out = (out + chunk.toString('utf8')).slice(-4000);
			if (!marker || !out.includes(marker)) return;
			seenAt = performance.now() - t0;
			const node = childrenOf(child.pid!)[0];
			const first = node === undefined ? undefined : memoryOf(node);
			for (const key of keys) {
				child.stdin.write(key);
				await sleep(gapMs);
			}
			await sleep(200);
			const edited = node === undefined ? undefined : memoryOf(node);
			child.stdin.write('\u0003');
			const exit = setTimeout(() => child.kill('SIGKILL'), 5000);
			child.on('exit', () => {
				clearTimeout(exit);
				clearTimeout(timer);
				resolve({
					ms: seenAt!,
					...(first && edited ? {firstMb: first.rssMb, editedMb: edited.rssMb, peakMb: edited.peakMb} : {}),
				});
			});
		});
		if (!marker) {
			child.on('exit', () => {
				clearTimeout(timer);
				resolve({ms: performance.now() - t0});
			});
		}
	});
}
