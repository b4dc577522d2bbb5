/**
 * Linear programmes with few unknowns and many inequality rows (the minimax stage of the slider fit).
 */
import {luFactor, luSolve, luSolveTransposed} from './dense-linear-algebra.js';
import {float64Room, int32Room, uint8Room} from './working-arrays.js';

/** One linear inequality Σ val·x[idx] (≤ or ≥, by context) rhs, stored sparsely. */
export interface Constraint {
	readonly idx: number[];
	readonly val: number[];
	readonly rhs: number;
}

/** Rows packed flat (compressed sparse rows): the pricing passes over every row run over flat arrays,
 * summing each row's entries in the same order as dotSparse (dense-linear-algebra.ts). Sized up front
 * and filled row by row, so callers with many rows make no object or array per row. */
export class PackedRows {
	/** Row j's entries are start[j] … start[j + 1] − 1 of idx and val. */
	start: Int32Array;
	idx: Int32Array;
	val: Float64Array;
	rhs: Float64Array;
	private rows = 0;
	private used = 0;

	/** Room for `maxRows` rows with `maxEntries` entries in all. */
	constructor(maxRows: number, maxEntries: number) {
		this.start = new Int32Array(maxRows + 1);
		this.idx = new Int32Array(maxEntries);
		this.val = new Float64Array(maxEntries);
		this.rhs = new Float64Array(maxRows);
	}

	/**
	 * Empties the rows for a new programme with room for `maxRows` rows and `maxEntries` entries,
	 * keeping the arrays when they are large enough (see working-arrays.ts for why). Only rows added
	 * since are ever read, so what the arrays held before does not matter.
	 */
	reset(maxRows: number, maxEntries: number): this {
		if (this.start.length < maxRows + 1) {
			this.start = new Int32Array(maxRows + 1);
			this.rhs = new Float64Array(maxRows);
		}
		if (this.idx.length < maxEntries) {
			this.idx = new Int32Array(maxEntries);
			this.val = new Float64Array(maxEntries);
		}
		this.rows = 0;
		this.used = 0;
		this.start[0] = 0;
		return this;
	}

	get count(): number {
		return this.rows;
	}

	/** Starts a row with right-hand side `rhs`; its entries follow with {@link entry}. */
	row(rhs: number): this {
		this.rhs[this.rows] = rhs;
		this.rows++;
		this.start[this.rows] = this.used;
		return this;
	}

	/** Adds the entry val·x[index] to the last row started. */
	entry(index: number, value: number): this {
		this.idx[this.used] = index;
		this.val[this.used] = value;
		this.used++;
		this.start[this.rows] = this.used;
		return this;
	}

	/** Adds sign·val[e]·x[idx[e]] for every e to the last row started. */
	entries(idx: readonly number[], val: readonly number[], sign = 1): this {
		for (let e = 0; e < idx.length; e++) this.entry(idx[e]!, sign * val[e]!);
		return this;
	}

	static of(cons: readonly Constraint[]): PackedRows {
		let total = 0;
		for (const c of cons) total += c.idx.length;
		const rows = new PackedRows(cons.length, total);
		for (const c of cons) rows.row(c.rhs).entries(c.idx, c.val);
		return rows;
	}
}

/** Dantzig pricing for rows of a known structure: the entering row for multipliers `pi`, or −1. */
export type DantzigPricing = (pi: Float64Array, inBasis: Uint8Array, tol: number) => number;

/** Row j of packed rows times x. */
export function packedDot(rows: PackedRows, j: number, x: ArrayLike<number>): number {
	const {start, idx, val} = rows;
	let s = 0;
	for (let e = start[j]!, end = start[j + 1]!; e < end; e++) s += val[e]! * x[idx[e]!]!;
	return s;
}

/** Writes row j into a dense column/vector `out` (entries added, so `out` starts zeroed) at stride. */
function scatterRow(rows: PackedRows, j: number, out: Float64Array, stride: number, offset: number): void {
	for (let e = rows.start[j]!, end = rows.start[j + 1]!; e < end; e++)
		out[rows.idx[e]! * stride + offset] = rows.val[e]!;
}

/** The simplex's working arrays, kept between calls (working-arrays.ts). */
const work = {
	inBasis: uint8Room(),
	b: float64Room(),
	piv: int32Room(),
	y: float64Room(),
	pi: float64Room(),
	w: float64Room(),
};

/** An optimum of {@link solveInequalityLp}: the primal solution and the dual basis it ended on. */
export interface LpSolution {
	readonly x: number[];
	readonly basis: readonly number[];
}

/**
 * Whether `basis` can start {@link solveInequalityLp}: n distinct rows whose matrix is regular and
 * whose dual values B⁻¹(−e_{n−1}) are all non-negative (dual feasible). For a start taken from another
 * programme's optimum, which must be checked before it is used.
 */
export function isDualFeasibleBasis(n: number, rows: PackedRows, basis: readonly number[]): boolean {
	if (basis.length !== n || basis.some((j) => !(j >= 0 && j < rows.count))) return false;
	const b = work.b.take(n * n);
	for (let i = 0; i < n; i++) scatterRow(rows, basis[i]!, b, n, i);
	const piv = work.piv.take(n);
	if (!luFactor(b, n, piv)) return false;
	const y = work.y.take(n);
	y[n - 1] = -1;
	luSolve(b, n, piv, y);
	for (let i = 0; i < n; i++) if (!(y[i]! >= 0)) return false;
	return true;
}

/**
 * min x[n−1] subject to rows a_j·x ≤ rhs_j, solved through its dual
 * min Σ rhs_j·y_j s.t. Σ y_j·a_j = −e_{n−1}, y ≥ 0, by a revised primal simplex on the dual.
 * The dual has only n equality rows (n = sliders + 1), so the basis is tiny however many samples
 * there are; the simplex multipliers π are the primal solution x. Dantzig pricing (most violated
 * primal row), switching to Bland's rule after a run of degenerate pivots so it cannot cycle.
 * `basis` must be dual feasible (B⁻¹(−e) ≥ 0). Returns null on numerical failure.
 * `price`, when given, finds the Dantzig row for rows of a known structure faster than a pass over
 * them all; it must return what that pass would (the lowest-numbered row among the most violated
 * non-basic ones with reduced cost below −tol, or −1). Bland's rule always uses the plain pass.
 */
export function solveInequalityLp(
	n: number,
	rows: PackedRows,
	start: readonly number[],
	price?: DantzigPricing,
): LpSolution | null {
	const count = rows.count;
	const basis = [...start];
	const inBasis = work.inBasis.take(count);
	for (const j of basis) inBasis[j] = 1;
	let rhsScale = 1;
	for (let j = 0; j < count; j++) rhsScale = Math.max(rhsScale, Math.abs(rows.rhs[j]!));
	const tolOpt = 1e-11 * rhsScale;
	const b = work.b.take(n * n);
	const piv = work.piv.take(n);
	const y = work.y.take(n);
	const pi = work.pi.take(n);
	const w = work.w.take(n);
	let degenerateRun = 0;
	const maxIter = 50 * (n + 10) + 4 * count;
	for (let iter = 0; iter < maxIter; iter++) {
		b.fill(0);
		for (let i = 0; i < n; i++) scatterRow(rows, basis[i]!, b, n, i);
		if (!luFactor(b, n, piv)) return null;
		y.fill(0);
		y[n - 1] = -1;
		luSolve(b, n, piv, y);
		for (let i = 0; i < n; i++) pi[i] = rows.rhs[basis[i]!]!;
		luSolveTransposed(b, n, piv, pi);

		const bland = degenerateRun > 30;
		let q = -1;
		if (price && !bland) q = price(pi, inBasis, tolOpt);
		else {
			let best = -tolOpt;
			for (let j = 0; j < count; j++) {
				if (inBasis[j]) continue;
				const d = rows.rhs[j]! - packedDot(rows, j, pi);
				if (d < best) {
					q = j;
					best = d;
					if (bland) break;
				}
			}
		}
		if (q < 0) return {x: Array.from(pi), basis: [...basis]};

		w.fill(0);
		scatterRow(rows, q, w, 1, 0);
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
