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
import {solveConvexQp} from './convex-qp.js';
import {dotSparse} from './dense-linear-algebra.js';
import {type DantzigPricing, isDualFeasibleBasis, PackedRows, solveInequalityLp} from './inequality-lp.js';
import {appliedGainDb, type HatWeights, hatWeights, knotDepths} from './slider-basis.js';
import {float64Room, int32Room, uint8Room} from './working-arrays.js';

/** What to fit: a sampled target curve, how deep it may be trusted, and the controls available. */
export interface FitRequest {
	/** Displayed depths of the target samples, cm, ascending, from 0. */
	readonly depthsCm: readonly number[];
	/** Target gain (compensation) at those depths, dB. */
	readonly targetDb: readonly number[];
	/** Samples deeper than this displayed depth (cm) are not fitted (blocked / below noise). */
	readonly usableDepthCm: number;
	/** Samples shallower than this displayed depth (cm) are not fitted either (the tissue harmonic's
	 * build-up zone); absent = from the skin. */
	readonly fitFromCm?: number;
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
 * M = h̄ − (bank.minDb + bank.maxDb)/2, where h̄ = Σ w_k·h_k / Σ w_k is the mean total weighted by
 * how much each slider acts on the usable depth range (w_k: the sum of its interpolation weights
 * over the usable samples), i.e. the value that puts the sliders' usable-depth average at the
 * centre of the slider range, then clamped into the feasible interval
 * [max(master.minDb, max h − bank.maxDb), min(master.maxDb, min h − bank.minDb)].
 * Sliders are s_k = h_k − M. A weighted mean moves smoothly when one slider's total or the usable
 * depth changes a little, so neighbouring rows of a sweep get neighbouring master gains; the
 * earlier midrange rule, (max h + min h)/2, jumped whenever a different slider became the
 * extreme (and was pulled by sliders held flat below the usable depth). With no usable sample the
 * plain mean is used.
 *
 * A usable range of zero length (usableDepthCm ≤ 0) fits nothing: the result is the flat naive
 * setting with residual 0.
 *
 * The bank's built-in ramp (rampDbPerCmMhz) is not modelled here: pass the target with the ramp
 * already subtracted, and the sliders come out as offsets from it.
 *
 * `memory`, when given, carries the stage-1 programme's final basis from one fit to the next: a
 * caller fitting a run of similar curves (a table's rows of one habitus at rising frequencies) starts
 * each from the last one's optimum, where it is still a valid start, instead of from scratch. The
 * optimum is the same (t* is unique; the tie-break then picks its unique point), so only rounding in
 * the last bits can differ from a fit without it.
 *
 * @returns sliders (knot depth cm, value dB), master gain dB, and the worst error (dB) with its
 * depth (cm), evaluated on every usable sample.
 */
export function fitSliders(req: FitRequest, memory?: FitMemory): SliderFit {
	const n = Math.floor(req.bank.count);
	if (!(n >= 1)) return masterOnlyFit(req);
	const data = usableSamples(req);
	if (data.depths.length === 0) return naiveFit(req);
	const bounds = totalBounds(req);
	if (bounds === null) return naiveFit(req);

	const knots = safeKnots(req);
	const rows = weightsOfBank(knots, req.bank.ends, data.depths);
	const lp = minimaxTotals(n, rows, data, bounds, knots, req.bank.ends, memory);
	if (lp === null) return naiveFit(req);

	let totals = lp.totals;
	const tau = lp.tStar + MINIMAX_SLACK * (1 + lp.tStar);
	const qp = tieBreakTotals(n, rows, data.targets, bounds, tau);
	if (qp !== null && acceptable(qp, rows, data.targets, bounds, tau)) totals = qp;

	const fit = settingFromTotals(req, knots, totals, {data, rows});
	// Defensive only: an optimal fit can never be worse than the naive one, whose setting is
	// realisable and so misses by at least t*. A fit within the slack of t* is therefore kept
	// without working the naive one out; only a fit that went wrong numerically is compared.
	if (fit.residualDb <= lp.tStar + 2 * MINIMAX_SLACK * (1 + lp.tStar)) return fit;
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
 * @returns residualDb (dB, 0 when nothing is usable) and atCm (displayed depth, cm, of the shallowest
 * sample whose error reaches it within 1e-4 dB; 0 when nothing is usable).
 */
export function fitError(
	req: FitRequest,
	sliderDb: readonly number[],
	masterDb: number,
): {residualDb: number; atCm: number} {
	const n = Math.max(0, Math.floor(req.bank.count) || 0);
	const knots = n >= 1 ? safeKnots(req) : [];
	const s = Array.from({length: knots.length}, (_, k) => finiteOr(sliderDb[k], 0));
	const m = finiteOr(masterDb, 0);
	const data = usableSamples(req);
	const errors = data.depths.map((d, i) =>
		Math.abs((knots.length === 0 ? m : appliedGainDb(knots, req.bank.ends, s, m, d)) - data.targets[i]!),
	);
	return worstSample(errors, data.depths);
}

/**
 * Errors this close to the largest count as reaching it, dB. A minimax fit misses several samples by
 * the same amount (it equioscillates); without a tolerance, which of them is named would be settled
 * by rounding noise of about 1e-12 dB and move by centimetres between two builds. Far below the
 * 0.1 dB any output shows.
 */
const worstTieDb = 1e-4;

/** The largest error and the shallowest depth whose error reaches it (within {@link worstTieDb}). */
function worstSample(errors: ArrayLike<number>, depths: readonly number[]): {residualDb: number; atCm: number} {
	let residualDb = 0;
	for (let i = 0; i < errors.length; i++) residualDb = Math.max(residualDb, errors[i]!);
	if (residualDb === 0) return {residualDb, atCm: 0};
	let i = 0;
	while (errors[i]! < residualDb - worstTieDb) i++;
	return {residualDb, atCm: depths[i]!};
}

// ---------------------------------------------------------------------------------------------
// Sampling, bounds and the master/slider split
// ---------------------------------------------------------------------------------------------

interface Samples {
	readonly depths: number[];
	readonly targets: number[];
}

export interface SparseWeights {
	readonly idx: number[];
	readonly val: number[];
}

export interface TotalBounds {
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
	const limit = req.usableDepthCm;
	const from = req.fitFromCm ?? 0;
	if (!(limit > 0)) return {depths: [], targets: []};
	const count = Math.min(req.depthsCm.length, req.targetDb.length);
	const usable = (i: number): boolean => {
		const d = req.depthsCm[i]!;
		return Number.isFinite(d) && Number.isFinite(req.targetDb[i]!) && d <= limit && d >= from;
	};
	// Usually the usable samples are one unbroken run (depths ascend): then each list is one copy.
	let first = 0;
	while (first < count && !usable(first)) first++;
	let end = first;
	while (end < count && usable(end)) end++;
	let after = end;
	while (after < count && !usable(after)) after++;
	if (after === count) return {depths: req.depthsCm.slice(first, end), targets: req.targetDb.slice(first, end)};
	const depths: number[] = [];
	const targets: number[] = [];
	for (let i = 0; i < count; i++) {
		if (usable(i)) {
			depths.push(req.depthsCm[i]!);
			targets.push(req.targetDb[i]!);
		}
	}
	return {depths, targets};
}

/** Knots, guarded against a zero or non-finite display depth (which would make weights 0/0). */
function safeKnots(req: FitRequest): number[] {
	const depth = Number.isFinite(req.displayDepthCm) && req.displayDepthCm > 0 ? req.displayDepthCm : 1;
	return knotDepths(req.bank, depth);
}

const hatScratch: HatWeights = [0, 0, 0, 0];

/** How many weights the rows hold in all (to size the packed constraint rows up front). */
function weightCount(rows: readonly SparseWeights[]): number {
	let count = 0;
	for (const r of rows) count += r.idx.length;
	return count;
}

/**
 * The hat weights of each sample depth under one bank, kept from the fit before: every row of a
 * table (and every slider edit in the console) samples the same depth grid under the same knots,
 * and these weights were a tenth of what a fit allocated. A fit's usable depths are a run of that
 * grid (they end where the echo meets the noise floor), so the longest run seen is kept and any
 * run inside it is served from it. One bank only: a run of different banks pays a comparison, not
 * a cache. The weights are never written to, so sharing them is safe; pure: the same knots and
 * depths give the same numbers whether kept or not.
 */
let lastBank: {
	ends: SliderBank['ends'];
	knots: readonly number[];
	depths: readonly number[];
	rows: SparseWeights[];
} | null = null;

const sameNumbers = (a: readonly number[], b: readonly number[]): boolean =>
	a.length === b.length && a.every((x, i) => x === b[i]);

function weightsOfBank(knots: readonly number[], ends: SliderBank['ends'], depths: readonly number[]): SparseWeights[] {
	const last = lastBank;
	const sameBank = last !== null && last.ends === ends && sameNumbers(last.knots, knots);
	if (sameBank && depths.length > 0) {
		const at = last.depths.indexOf(depths[0]!);
		if (at >= 0 && at + depths.length <= last.depths.length && depths.every((d, i) => d === last.depths[at + i]))
			return at === 0 && depths.length === last.rows.length ? last.rows : last.rows.slice(at, at + depths.length);
	}
	const rows = depths.map((d) => sparseWeights(knots, ends, d));
	if (!sameBank || depths.length >= last.depths.length) lastBank = {ends, knots: [...knots], depths: [...depths], rows};
	return rows;
}

/** Hat weights at one depth, as the non-zero entries only (at most two). */
function sparseWeights(knots: readonly number[], ends: SliderBank['ends'], depthCm: number): SparseWeights {
	const count = hatWeights(knots, ends, depthCm, hatScratch);
	const [k0, w0, k1, w1] = hatScratch;
	const keep0 = w0 !== 0 && Number.isFinite(w0);
	const keep1 = count === 2 && w1 !== 0 && Number.isFinite(w1);
	if (keep0 && keep1) return {idx: [k0, k1], val: [w0, w1]};
	if (keep0) return {idx: [k0], val: [w0]};
	if (keep1) return {idx: [k1], val: [w1]};
	return {idx: [], val: []};
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

/** The usable samples and their hat weights, when the caller has them already. */
interface Prepared {
	readonly data: Samples;
	readonly rows: readonly SparseWeights[];
}

/** Mean of the totals weighted by each slider's share of the usable depth range (split rule). */
function usableMeanTotal(totals: readonly number[], req: FitRequest, prepared?: Prepared): number {
	const data = prepared?.data ?? usableSamples(req);
	const knots = prepared ? [] : safeKnots(req);
	const w = totals.map(() => 0);
	for (let i = 0; i < data.depths.length; i++) {
		const row = prepared ? prepared.rows[i]! : sparseWeights(knots, req.bank.ends, data.depths[i]!);
		for (let j = 0; j < row.idx.length; j++) {
			const k = row.idx[j]!;
			if (k < w.length) w[k]! += Math.abs(row.val[j]!);
		}
	}
	let sw = 0;
	let swh = 0;
	for (let k = 0; k < totals.length; k++) {
		const h = totals[k]!;
		if (!Number.isFinite(h)) continue;
		sw += w[k]!;
		swh += w[k]! * h;
	}
	if (sw > 0) return swh / sw;
	const finite = totals.filter(Number.isFinite);
	return finite.length ? finite.reduce((a, b) => a + b, 0) / finite.length : 0;
}

/** Split totals into master + sliders (rule in fitSliders' TSDoc), clamping what cannot be reached. */
function splitTotals(
	totals: readonly number[],
	req: FitRequest,
	prepared?: Prepared,
): {masterDb: number; sliderDb: number[]} {
	const {bank, master} = req;
	let hMax = -Infinity;
	let hMin = Infinity;
	for (const h of totals) {
		if (h > hMax) hMax = h;
		if (h < hMin) hMin = h;
	}
	const ideal = usableMeanTotal(totals, req, prepared) - (bank.minDb + bank.maxDb) / 2;
	const lo = Math.max(master.minDb, hMax - bank.maxDb);
	const hi = Math.min(master.maxDb, hMin - bank.minDb);
	// When the fitted totals use the whole slider range, rounding (or the tie-break's 1e-9 slack) can
	// leave lo above hi by a hair; the master then goes midway, so no slider is clipped by more than
	// that hair. Clamping `ideal` into the master range instead clipped sliders by up to ~12 dB.
	const hair = 1e-6 * (1 + Math.abs(lo) + Math.abs(hi));
	const nearlyReachable = lo > hi && lo - hi <= hair;
	// Unreachable totals (naive fit only): centre the sliders as far as the master allows.
	let m = lo <= hi ? clamp(ideal, lo, hi) : clamp(ideal, master.minDb, master.maxDb);
	if (nearlyReachable) m = clamp((lo + hi) / 2, master.minDb, master.maxDb);
	const masterDb = finiteOr(m, finiteOr(master.minDb, 0));
	const sliderDb = totals.map((h) => finiteOr(clamp(h - masterDb, bank.minDb, bank.maxDb), finiteOr(bank.minDb, 0)));
	return {masterDb, sliderDb};
}

function settingFromTotals(
	req: FitRequest,
	knots: readonly number[],
	totals: readonly number[],
	prepared?: Prepared,
): SliderFit {
	const {masterDb, sliderDb} = splitTotals(totals, req, prepared);
	const sliders: SliderSetting[] = knots.map((depthCm, k) => ({depthCm, gainDb: sliderDb[k]!}));
	const err = prepared ? preparedError(prepared, sliderDb, masterDb) : fitError(req, sliderDb, masterDb);
	return {sliders, masterGainDb: masterDb, residualDb: err.residualDb, residualAtCm: err.atCm};
}

/** {@link fitError} from weights already worked out (the same sums: the weights left out are 0). */
function preparedError(
	{data, rows}: Prepared,
	sliderDb: readonly number[],
	masterDb: number,
): {residualDb: number; atCm: number} {
	const errors = sampleErrors.take(rows.length);
	for (let i = 0; i < rows.length; i++) {
		const r = rows[i]!;
		let g = masterDb;
		for (let e = 0; e < r.idx.length; e++) g += r.val[e]! * sliderDb[r.idx[e]!]!;
		errors[i] = Math.abs(g - data.targets[i]!);
	}
	return worstSample(errors, data.depths);
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

/** The constraint rows of the two stages and other working arrays, kept between fits (working-arrays.ts). */
const minimaxRows = new PackedRows(0, 0);
const tieBreakRows = new PackedRows(0, 0);
const tieBreakHessian = float64Room();
/** The minimax pricing's flat copy of the samples' weights (minimaxPricing). */
const pricingWork = {count: uint8Room(), k0: int32Room(), k1: int32Room(), w0: float64Room(), w1: float64Room()};
const sampleErrors = float64Room();

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
	data: Samples,
	b: TotalBounds,
	knots: readonly number[],
	ends: SliderBank['ends'],
	memory?: FitMemory,
): {totals: number[]; tStar: number} | null {
	const targets = data.targets;
	const tIndex = n;
	const m = rows.length;
	const weights = weightCount(rows);
	const cons = minimaxRows.reset(2 * m + 2 * n + n * (n - 1), 2 * (weights + m) + 2 * n + 2 * n * (n - 1));
	for (let i = 0; i < m; i++) {
		const r = rows[i]!;
		cons.row(targets[i]!).entries(r.idx, r.val).entry(tIndex, -1);
		cons.row(-targets[i]!).entries(r.idx, r.val, -1).entry(tIndex, -1);
	}
	const boxStart = cons.count;
	for (let k = 0; k < n; k++) {
		cons.row(b.hi).entry(k, 1);
		cons.row(-b.lo).entry(k, -1);
	}
	for (let j = 0; j < n; j++) {
		for (let k = 0; k < n; k++) if (j !== k) cons.row(b.spread).entry(j, 1).entry(k, -1);
	}
	// A dual-feasible starting basis: the first sample's upper residual row, and for every slider
	// the bound row whose normal cancels that sample's weight (so the dual values are the weights).
	const first = rows[0]!;
	let basis: number[] = [0];
	for (let k = 0; k < n; k++) {
		const e = first.idx.indexOf(k);
		const w = e >= 0 ? first.val[e]! : 0;
		basis.push(boxStart + 2 * k + (w < 0 ? 0 : 1));
	}
	const remembered = memory ? rememberedBasis(memory, n, data.depths, knots, ends, boxStart) : null;
	if (remembered && isDualFeasibleBasis(n + 1, cons, remembered)) basis = remembered;
	const solution = solveInequalityLp(n + 1, cons, basis, minimaxPricing(n, rows, targets, b, boxStart));
	if (solution === null) return null;
	const x = solution.x;
	if (memory) {
		// The depth of each sample row in the basis (all the next fit checks), not the whole list.
		const depthsOfBasis = solution.basis.map((j) => (j < boxStart ? data.depths[j >> 1]! : Number.NaN));
		memory.last = {sliders: n, depthsOfBasis, knots, ends, boxStart, basis: solution.basis};
	}
	const totals = Array.from({length: n}, (_, k) => x[k]!);
	if (!totals.every(Number.isFinite)) return null;
	return {totals, tStar: worstResidual(totals, rows, targets)};
}

/** What a fit leaves for the next one (see {@link fitSliders}): the stage-1 programme's final basis and its rows. */
export interface FitMemory {
	last?: {
		readonly sliders: number;
		/** For each row of the basis: the depth of its sample, cm (NaN for a bound or spread row). */
		readonly depthsOfBasis: readonly number[];
		readonly knots: readonly number[];
		readonly ends: SliderBank['ends'];
		readonly boxStart: number;
		readonly basis: readonly number[];
	};
}

/**
 * The last fit's final basis as rows of this programme, or null when it does not carry over: the same
 * sliders and knots, and each sample row it holds at the same depth here (so with the same weights);
 * the bound and spread rows follow the samples, so they move with their count.
 */
function rememberedBasis(
	memory: FitMemory,
	n: number,
	depths: readonly number[],
	knots: readonly number[],
	ends: SliderBank['ends'],
	boxStart: number,
): number[] | null {
	const last = memory.last;
	if (!last || last.sliders !== n || last.ends !== ends || !sameNumbers(last.knots, knots)) return null;
	const out: number[] = [];
	// Samples past this programme's last (a shallower noise floor) move to its deepest ones, in order.
	let deepest = depths.length - 1;
	const past = last.basis.filter((j) => j < last.boxStart && j >> 1 > deepest).sort((a, b) => b - a);
	const moved = new Map(past.map((j) => [j, 2 * deepest-- + (j & 1)]));
	for (let r = 0; r < last.basis.length; r++) {
		const j = last.basis[r]!;
		if (j >= last.boxStart) out.push(j - last.boxStart + boxStart);
		else {
			const to = moved.get(j) ?? j;
			const i = to >> 1;
			if (i < 0 || (!moved.has(j) && depths[i] !== last.depthsOfBasis[r])) return null;
			out.push(to);
		}
	}
	return out;
}

/**
 * The Dantzig choice of the stage-1 rows without a pass over each: a sample's two residual rows share
 * one weighted sum, and the most violated spread row is the pair of the largest and the smallest
 * total. The same reduced costs, summed in the same order, and the same lowest-numbered row on a tie
 * as the plain pass (a basic spread row has reduced cost 0, so it is never the most violated).
 */
export function minimaxPricing(
	n: number,
	rows: readonly SparseWeights[],
	targets: readonly number[],
	b: TotalBounds,
	boxStart: number,
): DantzigPricing {
	// The samples' weights laid out flat, once per programme: the pass below runs at every pivot, and
	// reading each row's own two arrays there was the largest single cost of a table's fits.
	const m = rows.length;
	const count = pricingWork.count.take(m);
	const k0 = pricingWork.k0.take(m);
	const k1 = pricingWork.k1.take(m);
	const w0 = pricingWork.w0.take(m);
	const w1 = pricingWork.w1.take(m);
	let flat = true;
	for (let i = 0; i < m; i++) {
		const r = rows[i]!;
		const c = r.idx.length;
		if (c > 2) flat = false;
		count[i] = c;
		if (c > 0) {
			k0[i] = r.idx[0]!;
			w0[i] = r.val[0]!;
		}
		if (c > 1) {
			k1[i] = r.idx[1]!;
			w1[i] = r.val[1]!;
		}
	}
	return (pi, inBasis, tol) => {
		const piT = pi[n]!;
		let q = -1;
		let best = -tol;
		for (let i = 0; i < m; i++) {
			// The weighted sum in the order dotSparse adds it.
			let s = 0;
			if (flat) {
				const c = count[i]!;
				if (c > 0) s += w0[i]! * pi[k0[i]!]!;
				if (c > 1) s += w1[i]! * pi[k1[i]!]!;
			} else {
				const r = rows[i]!;
				for (let e = 0; e < r.idx.length; e++) s += r.val[e]! * pi[r.idx[e]!]!;
			}
			if (!inBasis[2 * i]) {
				const d = targets[i]! - (s + -piT);
				if (d < best) {
					q = 2 * i;
					best = d;
				}
			}
			if (!inBasis[2 * i + 1]) {
				const d = -targets[i]! - (-s + -piT);
				if (d < best) {
					q = 2 * i + 1;
					best = d;
				}
			}
		}
		for (let k = 0; k < n; k++) {
			const j = boxStart + 2 * k;
			const hiD = b.hi - pi[k]!;
			if (!inBasis[j] && hiD < best) {
				q = j;
				best = hiD;
			}
			const loD = -b.lo - -pi[k]!;
			if (!inBasis[j + 1] && loD < best) {
				q = j + 1;
				best = loD;
			}
		}
		let top = 0;
		let bottom = 0;
		for (let k = 1; k < n; k++) {
			if (pi[k]! > pi[top]!) top = k;
			if (pi[k]! < pi[bottom]!) bottom = k;
		}
		if (top !== bottom) {
			const d = b.spread - (pi[top]! + -pi[bottom]!);
			// Spread rows run j = 0…n−1, k = 0…n−1 without k = j.
			const j = boxStart + 2 * n + top * (n - 1) + (bottom < top ? bottom : bottom - 1);
			if (d < best && !inBasis[j]) q = j;
		}
		return q;
	};
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
	const g = tieBreakHessian.take(n * n);
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
	const weights = weightCount(rows);
	const cons = tieBreakRows.reset(2 * m + 2 * n + n * (n - 1), 2 * weights + 2 * n + 2 * n * (n - 1));
	for (let i = 0; i < m; i++) {
		const r = rows[i]!;
		cons.row(targets[i]! - tau).entries(r.idx, r.val);
		cons.row(-targets[i]! - tau).entries(r.idx, r.val, -1);
	}
	for (let k = 0; k < n; k++) {
		cons.row(b.lo).entry(k, 1);
		cons.row(-b.hi).entry(k, -1);
	}
	for (let j = 0; j < n; j++) {
		for (let k = 0; k < n; k++) if (j !== k) cons.row(-b.spread).entry(j, -1).entry(k, 1);
	}
	const scale = 1 + Math.abs(b.lo) + Math.abs(b.hi) + tau + targets.reduce((s, t) => Math.max(s, Math.abs(t)), 0);
	const h = solveConvexQp(n, g, a, cons, 1e-11 * scale);
	return h === null ? null : Array.from(h);
}
