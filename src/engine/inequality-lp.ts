/**
 * Linear programmes with few unknowns and many inequality rows (the minimax stage of the slider fit).
 */
import {dotSparse, luFactor, luSolve, luSolveTransposed} from './dense-linear-algebra.js';

/** One linear inequality Σ val·x[idx] (≤ or ≥, by context) rhs, stored sparsely. */
export interface Constraint {
	readonly idx: number[];
	readonly val: number[];
	readonly rhs: number;
}

/**
 * min x[n−1] subject to rows a_j·x ≤ rhs_j, solved through its dual
 * min Σ rhs_j·y_j s.t. Σ y_j·a_j = −e_{n−1}, y ≥ 0, by a revised primal simplex on the dual.
 * The dual has only n equality rows (n = sliders + 1), so the basis is tiny however many samples
 * there are; the simplex multipliers π are the primal solution x. Dantzig pricing (most violated
 * primal row), switching to Bland's rule after a run of degenerate pivots so it cannot cycle.
 * `basis` must be dual feasible (B⁻¹(−e) ≥ 0). Returns null on numerical failure.
 */
export function solveInequalityLp(
	n: number,
	cons: readonly Constraint[],
	start: readonly number[],
): Float64Array | null {
	const count = cons.length;
	const basis = [...start];
	const inBasis = new Uint8Array(count);
	for (const j of basis) inBasis[j] = 1;
	let rhsScale = 1;
	for (const c of cons) rhsScale = Math.max(rhsScale, Math.abs(c.rhs));
	const tolOpt = 1e-11 * rhsScale;
	const b = new Float64Array(n * n);
	const piv = new Int32Array(n);
	const y = new Float64Array(n);
	const pi = new Float64Array(n);
	const w = new Float64Array(n);
	let degenerateRun = 0;
	const maxIter = 50 * (n + 10) + 4 * count;
	for (let iter = 0; iter < maxIter; iter++) {
		b.fill(0);
		for (let i = 0; i < n; i++) {
			const c = cons[basis[i]!]!;
			for (let e = 0; e < c.idx.length; e++) b[c.idx[e]! * n + i] = c.val[e]!;
		}
		if (!luFactor(b, n, piv)) return null;
		y.fill(0);
		y[n - 1] = -1;
		luSolve(b, n, piv, y);
		for (let i = 0; i < n; i++) pi[i] = cons[basis[i]!]!.rhs;
		luSolveTransposed(b, n, piv, pi);

		const bland = degenerateRun > 30;
		let q = -1;
		let best = -tolOpt;
		for (let j = 0; j < count; j++) {
			if (inBasis[j]) continue;
			const c = cons[j]!;
			const d = c.rhs - dotSparse(c, pi);
			if (d < best) {
				q = j;
				best = d;
				if (bland) break;
			}
		}
		if (q < 0) return pi;

		w.fill(0);
		const cq = cons[q]!;
		for (let e = 0; e < cq.idx.length; e++) w[cq.idx[e]!] = cq.val[e]!;
		luSolve(b, n, piv, w);
		let wMax = 0;
		for (let i = 0; i < n; i++) wMax = Math.max(wMax, Math.abs(w[i]!));
		const tolPiv = 1e-9 * wMax;
		let leave = -1;
		let ratio = Infinity;
		for (let i = 0; i < n; i++) {
			if (!(w[i]! > tolPiv)) continue;
			const theta = Math.max(y[i]!, 0) / w[i]!;
			const tie = leave >= 0 && Math.abs(theta - ratio) <= 1e-13 * (1 + ratio);
			if (tie ? (bland ? basis[i]! < basis[leave]! : w[i]! > w[leave]!) : theta < ratio) {
				leave = i;
				ratio = Math.min(theta, ratio);
			}
		}
		if (leave < 0) return null; // dual unbounded: the primal would be infeasible
		degenerateRun = ratio <= 1e-14 ? degenerateRun + 1 : 0;
		inBasis[basis[leave]!] = 0;
		basis[leave] = q;
		inBasis[q] = 1;
	}
	return null;
}
