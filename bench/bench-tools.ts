/** Small timing helpers shared by the benchmarks. */
import {performance} from 'node:perf_hooks';

/** Median wall time of `fn` over `runs` runs (after one warm-up), ms. */
export function medianMs(fn: () => void, runs: number): number {
	fn();
	const times: number[] = [];
	for (let i = 0; i < runs; i++) {
		const t0 = performance.now();
		fn();
		times.push(performance.now() - t0);
	}
	times.sort((a, b) => a - b);
	return times[Math.floor(times.length / 2)]!;
}

/** A line "name: value (target …, met/missed)". */
export function report(name: string, value: string, target?: string, met?: boolean): void {
	const suffix = target ? `  (target ${target}: ${met ? 'met' : 'MISSED'})` : '';
	console.log(`  ${name}: ${value}${suffix}`);
}

/** A deterministic pseudo-random sequence (mulberry32), so every run benchmarks the same plans. */
export function seeded(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}
