/**
 * Strictly convex quadratic programmes with inequality rows (the tie-break stage of the slider fit).
 */
import {backSolveTransposed, cholesky, forwardSolve, householderQr} from './dense-linear-algebra.js';
import {packedDot, type PackedRows} from './inequality-lp.js';
import {float64Room} from './working-arrays.js';

/** The Cholesky factor's room, kept between calls (working-arrays.ts). */
const choleskyFactor = float64Room();

/**
 * min ½hᵀGh + aᵀh subject to c_j·h ≥ rhs_j, G symmetric positive definite (row-major n×n).
 * Dual active-set method (Goldfarb & Idnani, 1983; citation from memory) in the coordinates y = Lᵀh where G = LLᵀ, so the
 * Hessian is the identity: start at the unconstrained minimum, repeatedly add the most violated
 * constraint, dropping active ones whose multiplier would turn negative. Each step keeps the
 * objective rising and the active set dual feasible, so it terminates; the Q/R factors of the
 * active normals are rebuilt from scratch each change (n ≤ 16: cheap, and no drift).
 * Returns null if infeasible or on numerical failure.
 */
export function solveConvexQp(
	n: number,
	hessian: Float64Array,
	linear: Float64Array,
	rows: PackedRows,
	tolFeas: number,
): Float64Array | null {
	const l = choleskyFactor.take(n * n);
	l.set(hessian);
	if (!cholesky(l, n)) return null;
	const y = Float64Array.from(linear, (v) => -v);
	forwardSolve(l, n, y);
	const h = new Float64Array(n);
	const toH = (): void => {
		h.set(y);
		backSolveTransposed(l, n, h);
	};
	const transformed = (j: number): Float64Array => {
		const v = new Float64Array(n);
		for (let e = rows.start[j]!, end = rows.start[j + 1]!; e < end; e++) v[rows.idx[e]!] = rows.val[e]!;
		forwardSolve(l, n, v);
		return v;
	};
	const normals: Float64Array[] = []; // active constraints, in y coordinates
	let u: number[] = [];
	let {q, r} = householderQr(normals, n);
	const refactor = (): void => {
		({q, r} = householderQr(normals, n));
	};
	const d = new Float64Array(n);
	const z = new Float64Array(n);
	const maxSteps = 20 * (n + 10) + 2 * rows.count;
	let steps = 0;
	for (;;) {
		toH();
		let p = -1;
		let worst = -tolFeas;
		for (let j = 0; j < rows.count; j++) {
			const s = packedDot(rows, j, h) - rows.rhs[j]!;
			if (s < worst) {
				worst = s;
				p = j;
			}
		}
		if (p < 0) return h;
		const np = transformed(p);
		let uPlus = 0;
		for (;;) {
			if (++steps > maxSteps) return null;
			const k = normals.length;
			// d = Qᵀ·n_p; z = Q₂·d₂ (primal step); rv = R⁻¹·d₁ (change of active multipliers).
			for (let i = 0; i < n; i++) {
				let s = 0;
				for (let row = 0; row < n; row++) s += q[row * n + i]! * np[row]!;
				d[i] = s;
			}
			z.fill(0);
			let d2 = 0;
			let dAll = 0;
			for (let i = 0; i < n; i++) dAll += d[i]! ** 2;
			for (let i = k; i < n; i++) d2 += d[i]! ** 2;
			const zeroStep = d2 <= 1e-24 * dAll;
			if (!zeroStep) {
				for (let row = 0; row < n; row++) {
					let s = 0;
					for (let i = k; i < n; i++) s += q[row * n + i]! * d[i]!;
					z[row] = s;
				}
			}
			const rv = new Float64Array(k);
			for (let i = k - 1; i >= 0; i--) {
				let s = d[i]!;
				for (let j = i + 1; j < k; j++) s -= r[i * k + j]! * rv[j]!;
				rv[i] = s / r[i * k + i]!;
			}
			let t1 = Infinity;
			let drop = -1;
			for (let j = 0; j < k; j++) {
				if (rv[j]! > 1e-14) {
					const ratio = u[j]! / rv[j]!;
					if (ratio < t1) {
						t1 = ratio;
						drop = j;
					}
				}
			}
			let sp = -rows.rhs[p]!;
			for (let i = 0; i < n; i++) sp += np[i]! * y[i]!;
			let t2 = Infinity;
			if (!zeroStep) {
				let zn = 0;
				for (let i = 0; i < n; i++) zn += z[i]! * np[i]!;
				if (zn > 0) t2 = Math.max(0, -sp) / zn;
			}
			const t = Math.min(t1, t2);
			if (t === Infinity) return null; // the constraints cannot all hold
			for (let j = 0; j < k; j++) u[j] = u[j]! - t * rv[j]!;
			uPlus += t;
			if (t2 !== Infinity) for (let i = 0; i < n; i++) y[i] = y[i]! + t * z[i]!;
			if (t2 <= t1) {
				normals.push(np);
				u.push(uPlus);
				refactor();
				break;
			}
			normals.splice(drop, 1);
			u = u.filter((_, j) => j !== drop);
			refactor();
		}
	}
}
