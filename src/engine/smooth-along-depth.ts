/**
 * Many values of a smooth function of depth from few exact evaluations: Chebyshev interpolation,
 * checked, with adaptive subdivision.
 *
 * Within one layer the broadband loss and the surviving centroid are analytic functions of depth
 * (ln of an integral whose integrand is analytic in depth), so their Chebyshev coefficients fall
 * geometrically (Trefethen 2013, Approximation Theory and Approximation Practice, ch. 8, from
 * memory). An interpolant on the Chebyshev–Lobatto points is accepted only when its last two
 * coefficients are far below the tolerance AND it matches one exact evaluation between nodes; else
 * the degree doubles once (the old nodes are reused), then the interval is halved. Where the
 * spectrum piles up against 0 MHz the function bends sharply and the check fails until the pieces
 * are short enough. This is an a-posteriori check, not a proof; the tolerance is kept 10× below the
 * engine's own quadrature accuracy so the interpolant never decides a result.
 */

/** Two outputs of one exact evaluation (loss dB, centroid MHz). */
export type Pair = readonly [number, number];

/** Degree tried first; doubled up to the last before the interval is split. */
const firstDegree = 4;
const lastDegree = 16;
/**
 * A piece with this many wanted points or fewer is evaluated exactly at each: with so few the doubled
 * degree cannot be tried, so a first try that fails (its 6 evaluations) is thrown away and every
 * point is evaluated anyway. The uncertainty band's 0.5 cm grid gives such pieces in 4 cm layers,
 * where the first degree falls short: 16 evaluations where 10 do. With 7 here, 1,000 varied plans
 * took 8 % more evaluations, the ten-layer console plan 22 % more (343 against 282).
 */
const exactBelow = 2 * firstDegree + 3;

/** cos(πjk/N) for j, k = 0…N, per degree N (row k): the same numbers every fit needs, worked out once. */
const cosineTables = new Map<number, Float64Array>();
function cosineTable(n: number): Float64Array {
	let table = cosineTables.get(n);
	if (!table) {
		table = new Float64Array((n + 1) * (n + 1));
		for (let k = 0; k <= n; k++) for (let j = 0; j <= n; j++) table[k * (n + 1) + j] = Math.cos((Math.PI * j * k) / n);
		cosineTables.set(n, table);
	}
	return table;
}

/**
 * n zeros in a plain array. The short arrays here (17 numbers at most) are made some ten times per
 * curve: as typed arrays over 64 bytes each would be an allocation outside V8's heap (working-arrays.ts).
 */
function zeros(n: number): number[] {
	return new Array<number>(n).fill(0);
}

/** Coefficients a_k of p(t) = Σ a_k·T_k(t) through values at t_j = cos(πj/N), j = 0…N. */
function chebyshevCoefficients(values: readonly number[]): number[] {
	const n = values.length - 1;
	const a = zeros(n + 1);
	const cosines = cosineTable(n);
	for (let k = 0; k <= n; k++) {
		let s = 0;
		const row = k * (n + 1);
		for (let j = 0; j <= n; j++) {
			const v = values[j]! * cosines[row + j]!;
			s += j === 0 || j === n ? v / 2 : v;
		}
		a[k] = ((k === 0 || k === n ? 1 : 2) * s) / n;
	}
	return a;
}

/** Clenshaw's sum of Σ a_k·T_k(t). */
function clenshaw(a: readonly number[], t: number): number {
	let b1 = 0;
	let b2 = 0;
	for (let k = a.length - 1; k >= 1; k--) {
		const b0 = 2 * t * b1 - b2 + a[k]!;
		b2 = b1;
		b1 = b0;
	}
	return t * b1 - b2 + a[0]!;
}

interface Interpolant {
	readonly first: readonly number[];
	readonly second: readonly number[];
}

/** Interpolant of `exact` on [lo, hi] at degree n, reusing values at the nodes already known. */
function fitAt(exact: (x: number) => Pair, lo: number, hi: number, n: number, known: Map<number, Pair>): Interpolant {
	const mid = (lo + hi) / 2;
	const half = (hi - lo) / 2;
	const v0 = zeros(n + 1);
	const v1 = zeros(n + 1);
	// Deepest node first is j = 0; evaluate shallow to deep so each integral's peak search starts near.
	for (let j = n; j >= 0; j--) {
		const key = j / n;
		let v = known.get(key);
		if (!v) {
			v = exact(j === 0 ? hi : j === n ? lo : mid + half * Math.cos((Math.PI * j) / n));
			known.set(key, v);
		}
		v0[j] = v[0];
		v1[j] = v[1];
	}
	return {first: chebyshevCoefficients(v0), second: chebyshevCoefficients(v1)};
}

const tail = (a: readonly number[]): number => Math.abs(a[a.length - 1]!) + Math.abs(a[a.length - 2]!);

/** Where {@link smoothAlong} writes: the first and second output, one array each (no pair per x). */
export interface PairColumns {
	readonly first: number[];
	readonly second: number[];
}

function put(out: PairColumns, i: number, v: Pair): void {
	out.first[i] = v[0];
	out.second[i] = v[1];
}

/**
 * `exact` at every x of `xs` (ascending, all inside one smooth stretch), each within `tolerance`
 * (per output) of the exact value; written into `out` at `offset + i`.
 */
export function smoothAlong(
	exact: (x: number) => Pair,
	xs: readonly number[],
	tolerance: Pair,
	out: PairColumns,
	offset = 0,
	depth = 0,
): void {
	const count = xs.length;
	if (count <= exactBelow || depth > 6) {
		for (let i = 0; i < count; i++) put(out, offset + i, exact(xs[i]!));
		return;
	}
	const lo = xs[0]!;
	const hi = xs[count - 1]!;
	const mid = (lo + hi) / 2;
	const half = (hi - lo) / 2;
	const known = new Map<number, Pair>();
	const good = (p: Interpolant, n: number): boolean => {
		if (tail(p.first) > tolerance[0] / 8 || tail(p.second) > tolerance[1] / 8) return false;
		// One exact value between the two central nodes (never a node of this or the doubled degree).
		const t = Math.cos((Math.PI * (Math.floor(n / 2) + 0.25)) / n);
		const check = exact(mid + half * t);
		return (
			Math.abs(clenshaw(p.first, t) - check[0]) <= tolerance[0] / 2 &&
			Math.abs(clenshaw(p.second, t) - check[1]) <= tolerance[1] / 2
		);
	};
	let p: Interpolant | undefined;
	let ok = false;
	// Nodes of degree n are the even nodes of degree 2n (keys j/n = 2j/2n): each doubling reuses them.
	for (let n = firstDegree; n <= lastDegree && !ok && count > n + 3; n *= 2) {
		p = fitAt(exact, lo, hi, n, known);
		ok = good(p, n);
	}
	if (ok && p) {
		for (let i = 0; i < count; i++) {
			const x = xs[i]!;
			// The ends are nodes: exact there.
			if (x === lo) put(out, offset + i, known.get(1) ?? exact(x));
			else if (x === hi) put(out, offset + i, known.get(0) ?? exact(x));
			else {
				const t = (x - mid) / half;
				out.first[offset + i] = clenshaw(p.first, t);
				out.second[offset + i] = clenshaw(p.second, t);
			}
		}
		return;
	}
	const split = count >> 1;
	smoothAlong(exact, xs.slice(0, split), tolerance, out, offset, depth + 1);
	smoothAlong(exact, xs.slice(split), tolerance, out, offset + split, depth + 1);
}
