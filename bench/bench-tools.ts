/** Timing helpers shared by the benchmarks: A/B alternation, CPU time, and the ✓/✗ target lines. */
import {performance} from 'node:perf_hooks';

export const median = (xs: readonly number[]): number => {
	const s = [...xs].sort((a, b) => a - b);
	const m = Math.floor(s.length / 2);
	return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

export const quantile = (xs: readonly number[], q: number): number => {
	const s = [...xs].sort((a, b) => a - b);
	return s[Math.min(s.length - 1, Math.max(0, Math.ceil(q * s.length) - 1))]!;
};

/** CPU time (user + system) of this process, ms. Counts every thread, so worker threads too. */
export function cpuMs(): number {
	const u = process.cpuUsage();
	return (u.user + u.system) / 1000;
}

export interface Measured {
	readonly wallMs: number;
	readonly cpuMs: number;
}

/** Wall and CPU time of one synchronous or asynchronous call. */
export async function measure(fn: () => unknown): Promise<Measured> {
	const c0 = cpuMs();
	const t0 = performance.now();
	await fn();
	return {wallMs: performance.now() - t0, cpuMs: cpuMs() - c0};
}

export interface Alternation {
	readonly a: Measured[];
	readonly b: Measured[];
	/** Per pair: B's time ÷ A's time (wall and CPU). */
	readonly wallRatios: number[];
	readonly cpuRatios: number[];
}

/**
 * Runs A and B alternately, A B A B …, after warming each the same number of times, so drifting
 * machine load and the JIT hit both sides alike. The ratio of interest is the median of the per-pair
 * ratios, not the ratio of medians.
 */
export async function alternate(a: () => unknown, b: () => unknown, pairs: number, warm = 1): Promise<Alternation> {
	for (let i = 0; i < warm; i++) {
		await a();
		await b();
	}
	const out: Alternation = {a: [], b: [], wallRatios: [], cpuRatios: []};
	for (let i = 0; i < pairs; i++) {
		const ma = await measure(a);
		const mb = await measure(b);
		out.a.push(ma);
		out.b.push(mb);
		out.wallRatios.push(mb.wallMs / ma.wallMs);
		out.cpuRatios.push(mb.cpuMs / ma.cpuMs);
	}
	return out;
}

export const ratioList = (rs: readonly number[]): string => rs.map((r) => r.toFixed(2)).join(' ');

interface TargetLine {
	readonly name: string;
	readonly value: string;
	readonly target: string;
	readonly met: boolean;
}

const targets: TargetLine[] = [];

/** A measured line with no target. */
export function note(name: string, value: string): void {
	console.log(`    ${name}: ${value}`);
}

/** A measured line against its target, marked ✓ or ✗, and kept for the closing summary. */
export function target(name: string, value: string, targetText: string, met: boolean): void {
	targets.push({name, value, target: targetText, met});
	console.log(`  ${met ? '✓' : '✗'} ${name}: ${value}  (target ${targetText})`);
}

/** The closing table of every target in this run. */
export function summary(): void {
	console.log('\nTargets');
	for (const t of targets) console.log(`  ${t.met ? '✓' : '✗'} ${t.name}: ${t.value} (target ${t.target})`);
	const missed = targets.filter((t) => !t.met).length;
	console.log(`  ${targets.length - missed} of ${targets.length} met`);
}

/** A deterministic pseudo-random sequence (the simulator's mulberry32), so every run benchmarks the same plans. */
export {mulberry32 as seeded} from '../src/simulate/seeded-random.js';
