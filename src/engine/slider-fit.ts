/**
 * Fits slider values and a master gain to a target compensation curve.
 *
 * The applied gain is g(d) = M + Σ_k s_k·φ_k(d) with the hat weights of slider-basis.ts. Because the
 * weights sum to one, only the totals h_k = M + s_k shape the curve; the split between master and
 * sliders is a separate, documented choice (see {@link fitSliders}).
 *
 * The fit is lexicographic:
 * 1. minimax: the smallest worst-case error t* over the usable samples, subject to the totals being
 *    realisable (a small LP, solved as its dual with a dense revised simplex);
 * 2. tie-break: among the minimax solutions, least squares plus a tiny smoothness term (a strictly
 *    convex QP, solved with a dual active-set method of the Goldfarb–Idnani kind).
 * Step 2 matters because once a bound is active the minimax optimum is not unique and a vertex of
 * the LP can have an arbitrary, useless shape.
 */
import type {SliderBank, SliderFit, SliderSetting} from './types.js';
import {appliedGainDb, basisWeights, knotDepths} from './slider-basis.js';

/** What to fit: a sampled target curve, how deep it may be trusted, and the controls available. */
export interface FitRequest {
	/** Displayed depths of the target samples, cm, ascending, from 0. */
	readonly depthsCm: readonly number[];
	/** Target gain (compensation) at those depths, dB. */
	readonly targetDb: readonly number[];
	/** Samples deeper than this displayed depth (cm) are not fitted (blocked / below noise). */
	readonly usableDepthCm: number;
	readonly bank: SliderBank;
	/** Current displayed depth, cm (sets the knot positions). */
	readonly displayDepthCm: number;
	/** Range of the master (overall) gain, dB. */
	readonly master: {readonly minDb: number; readonly maxDb: number};
}

/** Weight of the smoothness term Σ(h_{k+1} − h_k)² against the mean squared residual (dB²). */
const SMOOTHNESS = 1e-6;
/** Slack on t* in the tie-break, relative to (1 + t*): small enough to leave the minimax intact. */
const MINIMAX_SLACK = 1e-9;

// ---------------------------------------------------------------------------------------------
// Public API
// ---------------------------------------------------------------------------------------------

/**
 * Best starting sliders and master gain for a target curve.
 *
 * Minimises the worst |g(d_i) − T_i| over all usable samples (d_i ≤ usableDepthCm), not only at
 * the knots, over every realisable setting; ties are broken by least squares with a tiny smoothness
 * term, so sliders whose knots see no usable sample continue flat from the last fitted one.
 *
 * **Split rule.** From the fitted totals h_k (dB) the master gain is
 * M = (max h + min h)/2 − (bank.minDb + bank.maxDb)/2, i.e. the value that puts the sliders'
 * midrange, (max s + min s)/2, at the centre of the slider range, then clamped into the feasible
 * interval [max(master.minDb, max h − bank.maxDb), min(master.maxDb, min h − bank.minDb)].
 * Sliders are s_k = h_k − M. This leaves the most slider headroom both ways for live adjustment.
 *
 * A usable range of zero length (usableDepthCm ≤ 0) fits nothing: the result is the flat naive
 * setting with residual 0.
 *
 * The bank's built-in ramp (rampDbPerCmMhz) is not modelled here: pass the target with the ramp
 * already subtracted, and the sliders come out as offsets from it.
 *
 * @returns sliders (knot depth cm, value dB), master gain dB, and the worst error (dB) with its
 * depth (cm), evaluated on every usable sample.
 */
export function fitSliders(req: FitRequest): SliderFit {
	const n = Math.floor(req.bank.count);
	if (!(n >= 1)) return masterOnlyFit(req);
	const data = usableSamples(req);
	if (data.depths.length === 0) return naiveFit(req);
	const bounds = totalBounds(req);
	if (bounds === null) return naiveFit(req);

	const knots = safeKnots(req);
	const rows = data.depths.map((d) => sparseWeights(knots, req.bank.ends, d));
	const lp = minimaxTotals(n, rows, data.targets, bounds);
	if (lp === null) return naiveFit(req);

	let totals = lp.totals;
	const tau = lp.tStar + MINIMAX_SLACK * (1 + lp.tStar);
	const qp = tieBreakTotals(n, rows, data.targets, bounds, tau);
	if (qp !== null && acceptable(qp, rows, data.targets, bounds, tau)) totals = qp;

	const fit = settingFromTotals(req, knots, totals);
	// Defensive only: an optimal fit can never be worse than the naive one (it is realisable too),
	// beyond the tie-break's slack.
	const naive = naiveFit(req);
	return fit.residualDb <= naive.residualDb + 2 * MINIMAX_SLACK * (1 + naive.residualDb) ? fit : naive;
}

/**
 * The naive fit: each slider total = target sampled (linear interpolation) at its knot, then split
 * and clamped the same way as {@link fitSliders}.
 *
 * Knots deeper than the last usable sample read the target there (the curve beyond is not to be
 * matched); with no usable sample every total is the first target value, i.e. a flat setting.
 * Totals the controls cannot reach are clamped: master into its range, then each slider into its.
 */
export function naiveFit(req: FitRequest): SliderFit {
	const n = Math.floor(req.bank.count);
	if (!(n >= 1)) return masterOnlyFit(req);
	const knots = safeKnots(req);
	const data = usableSamples(req);
	let totals: number[];
	if (data.depths.length === 0) {
		const t0 = req.targetDb[0];
		const flat = t0 !== undefined && Number.isFinite(t0) ? t0 : 0;
		totals = knots.map(() => flat);
	} else {
		const deepest = data.depths[data.depths.length - 1]!;
		totals = knots.map((k) => interpolate(data.depths, data.targets, Math.min(k, deepest)));
	}
	return settingFromTotals(req, knots, totals);
}

/**
 * Worst |applied − target| over usable samples, and where.
 *
 * @param sliderDb slider values, dB (missing entries count as 0 dB).
 * @param masterDb master gain, dB.
 * @returns residualDb (dB, 0 when nothing is usable) and atCm (displayed depth, cm, of the first
 * sample with that error; 0 when nothing is usable).
 */
export function fitError(req: FitRequest, sliderDb: readonly number[], masterDb: number): {residualDb: number; atCm: number} {
	const n = Math.max(0, Math.floor(req.bank.count) || 0);
	const knots = n >= 1 ? safeKnots(req) : [];
	const s = Array.from({length: knots.length}, (_, k) => finiteOr(sliderDb[k], 0));
	const m = finiteOr(masterDb, 0);
	const data = usableSamples(req);
	let residualDb = 0;
	let atCm = 0;
	for (let i = 0; i < data.depths.length; i++) {
		const d = data.depths[i]!;
		const g = knots.length === 0 ? m : appliedGainDb(knots, req.bank.ends, s, m, d);
		const e = Math.abs(g - data.targets[i]!);
		if (e > residualDb) {
			residualDb = e;
			atCm = d;
		}
	}
	return {residualDb, atCm};
}

// ---------------------------------------------------------------------------------------------
// Sampling, bounds and the master/slider split
// ---------------------------------------------------------------------------------------------

interface Samples {
	readonly depths: number[];
	readonly targets: number[];
}

interface SparseWeights {
	readonly idx: number[];
	readonly val: number[];
}

interface TotalBounds {
	/** Lowest / highest reachable total, dB. */
	readonly lo: number;
	readonly hi: number;
	/** Largest spread between two totals (the slider range), dB. */
	readonly spread: number;
}

function finiteOr(x: number | undefined, fallback: number): number {
	return x !== undefined && Number.isFinite(x) ? x : fallback;
}

function clamp(x: number, lo: number, hi: number): number {
	return x < lo ? lo : x > hi ? hi : x;
}

/** Samples that the fit must match; non-finite ones are skipped so they can never leak NaN. */
function usableSamples(req: FitRequest): Samples {
	const depths: number[] = [];
	const targets: number[] = [];
	const limit = req.usableDepthCm;
	if (!(limit > 0)) return {depths, targets};
	const count = Math.min(req.depthsCm.length, req.targetDb.length);
	for (let i = 0; i < count; i++) {
		const d = req.depthsCm[i]!;
		const t = req.targetDb[i]!;
		if (Number.isFinite(d) && Number.isFinite(t) && d <= limit) {
			depths.push(d);
			targets.push(t);
		}
	}
	return {depths, targets};
}

/** Knots, guarded against a zero or non-finite display depth (which would make weights 0/0). */
function safeKnots(req: FitRequest): number[] {
	const depth = Number.isFinite(req.displayDepthCm) && req.displayDepthCm > 0 ? req.displayDepthCm : 1;
	return knotDepths(req.bank, depth);
}

/** Hat weights at one depth, as the non-zero entries only (at most two). */
function sparseWeights(knots: readonly number[], ends: SliderBank['ends'], depthCm: number): SparseWeights {
	const w = basisWeights(knots, ends, depthCm);
	const idx: number[] = [];
	const val: number[] = [];
	for (let k = 0; k < w.length; k++) {
		const v = w[k]!;
		if (v !== 0 && Number.isFinite(v)) {
			idx.push(k);
			val.push(v);
		}
	}
	return {idx, val};
}

function totalBounds(req: FitRequest): TotalBounds | null {
	const {bank, master} = req;
	const lo = master.minDb + bank.minDb;
	const hi = master.maxDb + bank.maxDb;
	const spread = bank.maxDb - bank.minDb;
	const ok = [lo, hi, spread].every(Number.isFinite) && lo <= hi && spread >= 0 && master.minDb <= master.maxDb;
	return ok ? {lo, hi, spread} : null;
}

/** Linear interpolation of a sampled curve (depths ascending), held flat outside the samples. */
function interpolate(depths: readonly number[], values: readonly number[], x: number): number {
	const last = depths.length - 1;
	if (x <= depths[0]!) return values[0]!;
	if (x >= depths[last]!) return values[last]!;
	let lo = 0;
	let hi = last;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (depths[mid]! <= x) lo = mid;
		else hi = mid;
	}
	const d0 = depths[lo]!;
	const d1 = depths[hi]!;
	if (d1 === d0) return values[hi]!;
	return values[lo]! + ((values[hi]! - values[lo]!) * (x - d0)) / (d1 - d0);
}

/** Split totals into master + sliders (rule in fitSliders' TSDoc), clamping what cannot be reached. */
function splitTotals(totals: readonly number[], req: FitRequest): {masterDb: number; sliderDb: number[]} {
	const {bank, master} = req;
	let hMax = -Infinity;
	let hMin = Infinity;
	for (const h of totals) {
		if (h > hMax) hMax = h;
		if (h < hMin) hMin = h;
	}
	const ideal = (hMax + hMin) / 2 - (bank.minDb + bank.maxDb) / 2;
	const lo = Math.max(master.minDb, hMax - bank.maxDb);
	const hi = Math.min(master.maxDb, hMin - bank.minDb);
	// Unreachable totals (naive fit only): centre the sliders as far as the master allows.
	const m = lo <= hi ? clamp(ideal, lo, hi) : clamp(ideal, master.minDb, master.maxDb);
	const masterDb = finiteOr(m, finiteOr(master.minDb, 0));
	const sliderDb = totals.map((h) => finiteOr(clamp(h - masterDb, bank.minDb, bank.maxDb), finiteOr(bank.minDb, 0)));
	return {masterDb, sliderDb};
}

function settingFromTotals(req: FitRequest, knots: readonly number[], totals: readonly number[]): SliderFit {
	const {masterDb, sliderDb} = splitTotals(totals, req);
	const sliders: SliderSetting[] = knots.map((depthCm, k) => ({depthCm, gainDb: sliderDb[k]!}));
	const err = fitError(req, sliderDb, masterDb);
	return {sliders, masterGainDb: masterDb, residualDb: err.residualDb, residualAtCm: err.atCm};
}

/** A bank without sliders: the master alone takes the midrange of the usable target. */
function masterOnlyFit(req: FitRequest): SliderFit {
	const data = usableSamples(req);
	let mid = 0;
	if (data.targets.length > 0) mid = (Math.max(...data.targets) + Math.min(...data.targets)) / 2;
	const lo = finiteOr(req.master.minDb, 0);
	const hi = Math.max(lo, finiteOr(req.master.maxDb, lo));
	const masterDb = clamp(mid, lo, hi);
	const err = fitError(req, [], masterDb);
	return {sliders: [], masterGainDb: masterDb, residualDb: err.residualDb, residualAtCm: err.atCm};
}

// ---------------------------------------------------------------------------------------------
// The two optimisation stages
// ---------------------------------------------------------------------------------------------

/** One linear inequality Σ val·x[idx] (≤ or ≥, by context) rhs, stored sparsely. */
interface Constraint {
	readonly idx: number[];
	readonly val: number[];
	readonly rhs: number;
}

function worstResidual(totals: ArrayLike<number>, rows: readonly SparseWeights[], targets: readonly number[]): number {
	let worst = 0;
	for (let i = 0; i < rows.length; i++) {
		const e = Math.abs(dotSparse(rows[i]!, totals) - targets[i]!);
		if (e > worst) worst = e;
	}
	return worst;
}

function addAt(a: Float64Array, i: number, v: number): void {
	a[i] = a[i]! + v;
}

function dotSparse(row: {readonly idx: number[]; readonly val: number[]}, x: ArrayLike<number>): number {
	let s = 0;
	for (let e = 0; e < row.idx.length; e++) s += row.val[e]! * x[row.idx[e]!]!;
	return s;
}

/** The QP result is used only if it is realisable and keeps the minimax error (else: LP vertex). */
function acceptable(
	totals: readonly number[],
	rows: readonly SparseWeights[],
	targets: readonly number[],
	b: TotalBounds,
	tau: number,
): boolean {
	const scale = 1 + Math.abs(b.lo) + Math.abs(b.hi) + tau;
	const slack = 1e-9 * scale;
	let hMax = -Infinity;
	let hMin = Infinity;
	for (const h of totals) {
		if (!Number.isFinite(h) || h < b.lo - slack || h > b.hi + slack) return false;
		hMax = Math.max(hMax, h);
		hMin = Math.min(hMin, h);
	}
	return hMax - hMin <= b.spread + slack && worstResidual(totals, rows, targets) <= tau + slack;
}

/**
 * Stage 1: minimise t subject to |φ_i·h − T_i| ≤ t, lo ≤ h_k ≤ hi, h_j − h_k ≤ spread.
 * Variables x = (h_0 … h_{n−1}, t); all constraints are rows a·x ≤ rhs.
 */
function minimaxTotals(
	n: number,
	rows: readonly SparseWeights[],
	targets: readonly number[],
	b: TotalBounds,
): {totals: number[]; tStar: number} | null {
	const tIndex = n;
	const cons: Constraint[] = [];
	for (let i = 0; i < rows.length; i++) {
		const r = rows[i]!;
		cons.push({idx: [...r.idx, tIndex], val: [...r.val, -1], rhs: targets[i]!});
		cons.push({idx: [...r.idx, tIndex], val: [...r.val.map((v) => -v), -1], rhs: -targets[i]!});
	}
	const boxStart = cons.length;
	for (let k = 0; k < n; k++) {
		cons.push({idx: [k], val: [1], rhs: b.hi});
		cons.push({idx: [k], val: [-1], rhs: -b.lo});
	}
	for (let j = 0; j < n; j++) {
		for (let k = 0; k < n; k++) if (j !== k) cons.push({idx: [j, k], val: [1, -1], rhs: b.spread});
	}
	// A dual-feasible starting basis: the first sample's upper residual row, and for every slider
	// the bound row whose normal cancels that sample's weight (so the dual values are the weights).
	const first = rows[0]!;
	const basis: number[] = [0];
	for (let k = 0; k < n; k++) {
		const e = first.idx.indexOf(k);
		const w = e >= 0 ? first.val[e]! : 0;
		basis.push(boxStart + 2 * k + (w < 0 ? 0 : 1));
	}
	const x = solveInequalityLp(n + 1, cons, basis);
	if (x === null) return null;
	const totals = Array.from({length: n}, (_, k) => x[k]!);
	if (!totals.every(Number.isFinite)) return null;
	return {totals, tStar: worstResidual(totals, rows, targets)};
}

/**
 * Stage 2: minimise mean(r_i²) + SMOOTHNESS·Σ(h_{k+1} − h_k)² subject to |r_i| ≤ tau and
 * realisability. The smoothness term makes the Hessian positive definite (the constant direction is
 * seen by the residuals, every other one by the differences) and holds uncovered sliders flat.
 */
function tieBreakTotals(
	n: number,
	rows: readonly SparseWeights[],
	targets: readonly number[],
	b: TotalBounds,
	tau: number,
): number[] | null {
	const m = rows.length;
	const g = new Float64Array(n * n);
	const a = new Float64Array(n);
	for (let i = 0; i < m; i++) {
		const r = rows[i]!;
		for (let e = 0; e < r.idx.length; e++) {
			const p = r.idx[e]!;
			a[p] = a[p]! - (r.val[e]! * targets[i]!) / m;
			for (let f = 0; f < r.idx.length; f++) addAt(g, p * n + r.idx[f]!, (r.val[e]! * r.val[f]!) / m);
		}
	}
	for (let k = 0; k + 1 < n; k++) {
		addAt(g, k * n + k, SMOOTHNESS);
		addAt(g, (k + 1) * n + k + 1, SMOOTHNESS);
		addAt(g, k * n + k + 1, -SMOOTHNESS);
		addAt(g, (k + 1) * n + k, -SMOOTHNESS);
	}
	// Constraints in the form c·h ≥ rhs.
	const cons: Constraint[] = [];
	for (let i = 0; i < m; i++) {
		const r = rows[i]!;
		cons.push({idx: r.idx, val: r.val, rhs: targets[i]! - tau});
		cons.push({idx: r.idx, val: r.val.map((v) => -v), rhs: -targets[i]! - tau});
	}
	for (let k = 0; k < n; k++) {
		cons.push({idx: [k], val: [1], rhs: b.lo});
		cons.push({idx: [k], val: [-1], rhs: -b.hi});
	}
	for (let j = 0; j < n; j++) {
		for (let k = 0; k < n; k++) if (j !== k) cons.push({idx: [j, k], val: [-1, 1], rhs: -b.spread});
	}
	const scale = 1 + Math.abs(b.lo) + Math.abs(b.hi) + tau + targets.reduce((s, t) => Math.max(s, Math.abs(t)), 0);
	const h = solveConvexQp(n, g, a, cons, 1e-11 * scale);
	return h === null ? null : Array.from(h);
}

// ---------------------------------------------------------------------------------------------
// Dense linear algebra (n ≤ ~17, so recomputing factorisations each step is cheap and stable)
// ---------------------------------------------------------------------------------------------

/** In-place LU with partial pivoting of a row-major n×n matrix. False if (numerically) singular. */
function luFactor(a: Float64Array, n: number, piv: Int32Array): boolean {
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
function luSolve(lu: Float64Array, n: number, piv: Int32Array, b: Float64Array): void {
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
function luSolveTransposed(lu: Float64Array, n: number, piv: Int32Array, b: Float64Array): void {
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

/**
 * min x[n−1] subject to rows a_j·x ≤ rhs_j, solved through its dual
 * min Σ rhs_j·y_j s.t. Σ y_j·a_j = −e_{n−1}, y ≥ 0, by a revised primal simplex on the dual.
 * The dual has only n equality rows (n = sliders + 1), so the basis is tiny however many samples
 * there are; the simplex multipliers π are the primal solution x. Dantzig pricing (most violated
 * primal row), switching to Bland's rule after a run of degenerate pivots so it cannot cycle.
 * `basis` must be dual feasible (B⁻¹(−e) ≥ 0). Returns null on numerical failure.
 */
function solveInequalityLp(n: number, cons: readonly Constraint[], start: readonly number[]): Float64Array | null {
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

/** In-place lower Cholesky factor of a row-major SPD matrix. False if not positive definite. */
function cholesky(g: Float64Array, n: number): boolean {
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
function forwardSolve(l: Float64Array, n: number, v: Float64Array): void {
	for (let i = 0; i < n; i++) {
		let s = v[i]!;
		for (let k = 0; k < i; k++) s -= l[i * n + k]! * v[k]!;
		v[i] = s / l[i * n + i]!;
	}
}

/** v ← L⁻ᵀ·v (back substitution). */
function backSolveTransposed(l: Float64Array, n: number, v: Float64Array): void {
	for (let i = n - 1; i >= 0; i--) {
		let s = v[i]!;
		for (let k = i + 1; k < n; k++) s -= l[k * n + i]! * v[k]!;
		v[i] = s / l[i * n + i]!;
	}
}

/**
 * Householder QR of the n×q matrix whose columns are `cols`: returns Q (n×n, row-major, explicit)
 * and R (q×q, row-major, upper triangular) with cols = Q·[R; 0].
 */
function householderQr(cols: readonly Float64Array[], n: number): {q: Float64Array; r: Float64Array} {
	const qn = cols.length;
	const a = new Float64Array(n * qn); // row-major n×q
	for (let j = 0; j < qn; j++) for (let i = 0; i < n; i++) a[i * qn + j] = cols[j]![i]!;
	const q = new Float64Array(n * n);
	for (let i = 0; i < n; i++) q[i * n + i] = 1;
	const v = new Float64Array(n);
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
	const r = new Float64Array(qn * qn);
	for (let i = 0; i < qn; i++) for (let j = i; j < qn; j++) r[i * qn + j] = a[i * qn + j]!;
	return {q, r};
}

/**
 * min ½hᵀGh + aᵀh subject to c_j·h ≥ rhs_j, G symmetric positive definite (row-major n×n).
 * Dual active-set method (Goldfarb & Idnani, 1983; citation from memory) in the coordinates y = Lᵀh where G = LLᵀ, so the
 * Hessian is the identity: start at the unconstrained minimum, repeatedly add the most violated
 * constraint, dropping active ones whose multiplier would turn negative. Each step keeps the
 * objective rising and the active set dual feasible, so it terminates; the Q/R factors of the
 * active normals are rebuilt from scratch each change (n ≤ 16: cheap, and no drift).
 * Returns null if infeasible or on numerical failure.
 */
function solveConvexQp(
	n: number,
	hessian: Float64Array,
	linear: Float64Array,
	cons: readonly Constraint[],
	tolFeas: number,
): Float64Array | null {
	const l = Float64Array.from(hessian);
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
		const c = cons[j]!;
		for (let e = 0; e < c.idx.length; e++) v[c.idx[e]!] = c.val[e]!;
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
	const maxSteps = 20 * (n + 10) + 2 * cons.length;
	let steps = 0;
	for (;;) {
		toH();
		let p = -1;
		let worst = -tolFeas;
		for (let j = 0; j < cons.length; j++) {
			const c = cons[j]!;
			const s = dotSparse(c, h) - c.rhs;
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
			let sp = -cons[p]!.rhs;
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
