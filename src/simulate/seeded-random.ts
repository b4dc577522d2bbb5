/**
 * A small seeded generator so the same seed gives the same picture on every machine: mulberry32
 * for uniform numbers (a 32-bit state, fast and well spread for pictures; not for cryptography)
 * and Box–Muller for Gaussian pairs, which is exactly what a complex Gaussian sample needs.
 */

/** Uniform numbers in [0, 1) from a 32-bit seed. */
export function mulberry32(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/**
 * Fills `re` and `im` with independent standard normal samples (Box–Muller: one pair of uniforms
 * gives one complex sample, so each component has variance 1 and |z|² has mean 2).
 */
export function fillComplexGaussian(next: () => number, re: Float32Array, im: Float32Array): void {
	for (let i = 0; i < re.length; i++) {
		// 1 − u keeps the logarithm finite (u can be 0, never 1).
		const radius = Math.sqrt(-2 * Math.log(1 - next()));
		const angle = 2 * Math.PI * next();
		re[i] = radius * Math.cos(angle);
		im[i] = radius * Math.sin(angle);
	}
}
