/**
 * Small dense linear algebra for the slider fit's solvers (n ≤ ~17 unknowns, row-major
 * Float64Arrays): factorisations are cheap enough to recompute at every step, which keeps them stable.
 */
import {float64Room} from './working-arrays.js';

/** In-place LU with partial pivoting of a row-major n×n matrix. False if (numerically) singular. */
export function luFactor(a: Float64Array, n: number, piv: Int32Array): boolean {
	let norm = 0;
	for (let i = 0; i < n * n; i++) norm = Math.max(norm, Math.abs(a[i]!));
	const tiny = 1e-14 * (norm || 1);
	for (let k = 0; k < n; k++) {
		let p = k;
		let best = Math.abs(a[k * n + k]!);
		for (let i = k + 1; i < n; i++) {
			const v = Math.abs(a[i * n + k]!);
			if (v > best) {
				best = v;
				p = i;
			}
		}
		if (!(best > tiny)) return false;
		piv[k] = p;
		if (p !== k) {
			for (let j = 0; j < n; j++) {
				const t = a[k * n + j]!;
				a[k * n + j] = a[p * n + j]!;
				a[p * n + j] = t;
			}
		}
		const d = a[k * n + k]!;
		for (let i = k + 1; i < n; i++) {
			const f = a[i * n + k]! / d;
			a[i * n + k] = f;
			if (f !== 0) for (let j = k + 1; j < n; j++) a[i * n + j] = a[i * n + j]! - f * a[k * n + j]!;
		}
	}
	return true;
}

/** Solve A·x = b in place after luFactor. */
export function luSolve(lu: Float64Array, n: number, piv: Int32Array, b: Float64Array): void {
	for (let k = 0; k < n; k++) {
		const p = piv[k]!;
		if (p !== k) {
			const t = b[k]!;
			b[k] = b[p]!;
			b[p] = t;
		}
	}
	for (let i = 1; i < n; i++) {
		let s = b[i]!;
		for (let j = 0; j < i; j++) s -= lu[i * n + j]! * b[j]!;
		b[i] = s;
	}
	for (let i = n - 1; i >= 0; i--) {
		let s = b[i]!;
		for (let j = i + 1; j < n; j++) s -= lu[i * n + j]! * b[j]!;
		b[i] = s / lu[i * n + i]!;
	}
}

/** Solve Aᵀ·x = b in place after luFactor (PA = LU ⇒ UᵀLᵀ(P x) = b). */
export function luSolveTransposed(lu: Float64Array, n: number, piv: Int32Array, b: Float64Array): void {
	for (let i = 0; i < n; i++) {
		let s = b[i]!;
		for (let j = 0; j < i; j++) s -= lu[j * n + i]! * b[j]!;
		b[i] = s / lu[i * n + i]!;
	}
	for (let i = n - 1; i >= 0; i--) {
		let s = b[i]!;
		for (let j = i + 1; j < n; j++) s -= lu[j * n + i]! * b[j]!;
		b[i] = s;
	}
	for (let k = n - 1; k >= 0; k--) {
		const p = piv[k]!;
		if (p !== k) {
			const t = b[k]!;
			b[k] = b[p]!;
			b[p] = t;
		}
	}
}

/** In-place lower Cholesky factor of a row-major SPD matrix. False if not positive definite. */
export function cholesky(g: Float64Array, n: number): boolean {
	for (let j = 0; j < n; j++) {
		let d = g[j * n + j]!;
		for (let k = 0; k < j; k++) d -= g[j * n + k]! ** 2;
		if (!(d > 0)) return false;
		const l = Math.sqrt(d);
		g[j * n + j] = l;
		for (let i = j + 1; i < n; i++) {
			let s = g[i * n + j]!;
			for (let k = 0; k < j; k++) s -= g[i * n + k]! * g[j * n + k]!;
			g[i * n + j] = s / l;
		}
		for (let i = 0; i < j; i++) g[i * n + j] = 0;
	}
	return true;
}

/** v ← L⁻¹·v (forward substitution). */
export function forwardSolve(l: Float64Array, n: number, v: Float64Array): void {
	for (let i = 0; i < n; i++) {
		let s = v[i]!;
		for (let k = 0; k < i; k++) s -= l[i * n + k]! * v[k]!;
		v[i] = s / l[i * n + i]!;
	}
}

/** v ← L⁻ᵀ·v (back substitution). */
export function backSolveTransposed(l: Float64Array, n: number, v: Float64Array): void {
	for (let i = n - 1; i >= 0; i--) {
		let s = v[i]!;
		for (let k = i + 1; k < n; k++) s -= l[k * n + i]! * v[k]!;
		v[i] = s / l[i * n + i]!;
	}
}

/** The factorisation's working arrays, kept between calls (working-arrays.ts). */
const qrWork = {a: float64Room(), q: float64Room(), v: float64Room(), r: float64Room()};

/**
 * Householder QR of the n×q matrix whose columns are `cols`: returns Q (n×n, row-major, explicit)
 * and R (q×q, row-major, upper triangular) with cols = Q·[R; 0]. Q and R are overwritten by the next
 * call: its one caller refactors from scratch whenever its columns change, and drops the old ones.
 */
export function householderQr(cols: readonly Float64Array[], n: number): {q: Float64Array; r: Float64Array} {
	const qn = cols.length;
	const a = qrWork.a.take(n * qn); // row-major n×q
	for (let j = 0; j < qn; j++) for (let i = 0; i < n; i++) a[i * qn + j] = cols[j]![i]!;
	const q = qrWork.q.take(n * n);
	for (let i = 0; i < n; i++) q[i * n + i] = 1;
	const v = qrWork.v.take(n);
	for (let j = 0; j < qn && j < n; j++) {
		let norm = 0;
		for (let i = j; i < n; i++) norm += a[i * qn + j]! ** 2;
		norm = Math.sqrt(norm);
		if (norm === 0) continue;
		const alpha = a[j * qn + j]! > 0 ? -norm : norm;
		for (let i = j; i < n; i++) v[i] = a[i * qn + j]!;
		v[j] = v[j]! - alpha;
		let vv = 0;
		for (let i = j; i < n; i++) vv += v[i]! ** 2;
		if (vv === 0) continue;
		const beta = 2 / vv;
		for (let c = j; c < qn; c++) {
			let s = 0;
			for (let i = j; i < n; i++) s += v[i]! * a[i * qn + c]!;
			s *= beta;
			for (let i = j; i < n; i++) a[i * qn + c] = a[i * qn + c]! - s * v[i]!;
		}
		for (let row = 0; row < n; row++) {
			let s = 0;
			for (let i = j; i < n; i++) s += q[row * n + i]! * v[i]!;
			s *= beta;
			for (let i = j; i < n; i++) q[row * n + i] = q[row * n + i]! - s * v[i]!;
		}
	}
	const r = qrWork.r.take(qn * qn);
	for (let i = 0; i < qn; i++) for (let j = i; j < qn; j++) r[i * qn + j] = a[i * qn + j]!;
	return {q, r};
}

/** Σ val·x[idx] of a sparsely stored row. */
export function dotSparse(row: {readonly idx: number[]; readonly val: number[]}, x: ArrayLike<number>): number {
	let s = 0;
	for (let e = 0; e < row.idx.length; e++) s += row.val[e]! * x[row.idx[e]!]!;
	return s;
}
