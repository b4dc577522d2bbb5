import {describe, expect, it} from 'vitest';
import {minimaxPricing, type SparseWeights} from '../../src/engine/slider-fit.js';
import {mulberry32 as seeded} from '../../src/simulate/seeded-random.js';

/**
 * The fit's stage-1 LP prices its rows by structure (a sample's two residual rows from one weighted
 * sum, the spread rows from the largest and smallest total). Checked here against the plain Dantzig
 * rule written out independently over explicit rows (most negative reduced cost rhs − a·π among
 * non-basic rows, the lowest-numbered on a tie; Dantzig 1963, Linear Programming and Extensions, from
 * memory), on random rows, multipliers and bases, including tied multipliers.
 */

interface Row {
	readonly a: Map<number, number>;
	readonly rhs: number;
}

/** The stage-1 rows as documented in slider-fit.ts: per sample |φ·h − T| ≤ t as two rows, then
 * lo ≤ h_k ≤ hi, then h_j − h_k ≤ spread for every ordered pair j ≠ k. Variable n is t. */
function explicitRows(
	n: number,
	rows: SparseWeights[],
	targets: number[],
	lo: number,
	hi: number,
	spread: number,
): Row[] {
	const out: Row[] = [];
	rows.forEach((r, i) => {
		const up = new Map<number, number>();
		const down = new Map<number, number>();
		r.idx.forEach((k, e) => {
			up.set(k, r.val[e]!);
			down.set(k, -r.val[e]!);
		});
		up.set(n, -1);
		down.set(n, -1);
		out.push({a: up, rhs: targets[i]!}, {a: down, rhs: -targets[i]!});
	});
	for (let k = 0; k < n; k++) out.push({a: new Map([[k, 1]]), rhs: hi}, {a: new Map([[k, -1]]), rhs: -lo});
	for (let j = 0; j < n; j++)
		for (let k = 0; k < n; k++)
			if (j !== k)
				out.push({
					a: new Map([
						[j, 1],
						[k, -1],
					]),
					rhs: spread,
				});
	return out;
}

function plainDantzig(rows: Row[], pi: Float64Array, inBasis: Uint8Array, tol: number): number {
	let q = -1;
	let best = -tol;
	rows.forEach((r, j) => {
		if (inBasis[j]) return;
		let s = 0;
		for (const [k, v] of r.a) s += v * pi[k]!;
		const d = r.rhs - s;
		if (d < best) {
			q = j;
			best = d;
		}
	});
	return q;
}

describe('structured pricing of the minimax LP', () => {
	it('picks the row the plain Dantzig rule picks, on 2,000 random cases', () => {
		const rand = seeded(11);
		let entered = 0;
		for (let c = 0; c < 2000; c++) {
			const n = 1 + Math.floor(rand() * 12);
			const m = 1 + Math.floor(rand() * 40);
			const rows: SparseWeights[] = Array.from({length: m}, () => {
				const k = Math.floor(rand() * n);
				if (k + 1 >= n || rand() < 0.2) return {idx: [k], val: [1]};
				const t = rand();
				return {idx: [k, k + 1], val: [1 - t, t]};
			});
			const targets = rows.map(() => (rand() - 0.5) * 80);
			const lo = -20 - rand() * 20;
			const hi = 20 + rand() * 40;
			const spread = rand() * 30;
			const explicit = explicitRows(n, rows, targets, lo, hi, spread);
			// Multipliers, a few of them tied (totals at the same bound).
			const pi = Float64Array.from({length: n + 1}, () => (rand() - 0.5) * 100);
			if (rand() < 0.5) for (let k = 0; k < n; k++) if (rand() < 0.4) pi[k] = hi;
			const inBasis = new Uint8Array(explicit.length);
			for (let j = 0; j < explicit.length; j++) if (rand() < 0.1) inBasis[j] = 1;
			// A basic row's reduced cost is 0 in the simplex; a random basis here must not make the spread
			// block's extreme pair basic unless it really is tight, so mark basic only rows with d ≥ 0.
			explicit.forEach((r, j) => {
				let s = 0;
				for (const [k, v] of r.a) s += v * pi[k]!;
				if (r.rhs - s < 0 && j >= 2 * m + 2 * n) inBasis[j] = 0;
			});
			const tol = 1e-11 * 100;
			const price = minimaxPricing(n, rows, targets, {lo, hi, spread}, 2 * m);
			const want = plainDantzig(explicit, pi, inBasis, tol);
			expect(price(pi, inBasis, tol)).toBe(want);
			if (want >= 0) entered++;
		}
		expect(entered).toBeGreaterThan(1000);
	});
});
