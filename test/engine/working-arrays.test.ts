import {describe, expect, it} from 'vitest';
import {fitSliders, type FitRequest} from '../../src/engine/slider-fit.js';
import type {SliderBank} from '../../src/engine/types.js';
import {float64Room} from '../../src/engine/working-arrays.js';

// The solvers keep their working arrays between calls (for speed); these checks hold that keeping
// them changes no result. The expected values are the fits' own, computed first on fresh arrays.

describe('working arrays kept between calls', () => {
	it('hand out zeroed views of exactly the length asked for, growing when needed', () => {
		const room = float64Room();
		const first = room.take(5);
		first.fill(7);
		const second = room.take(3);
		expect(second.length).toBe(3);
		expect([...second]).toEqual([0, 0, 0]);
		const larger = room.take(40);
		expect(larger.length).toBe(40);
		expect(larger.every((v) => v === 0)).toBe(true);
	});

	const bank = (count: number): SliderBank => ({
		count,
		minDb: -15,
		maxDb: 15,
		knots: 'band-centres',
		ends: 'flat',
		rampDbPerCmMhz: 0,
	});
	const request = (count: number, depthCm: number, steps: number, usableCm: number): FitRequest => {
		const depthsCm = Array.from({length: steps + 1}, (_, i) => (i * depthCm) / steps);
		// A curve with a bend the sliders cannot follow exactly, so both stages of the fit have work.
		const targetDb = depthsCm.map((z) => 1.8 * z + 6 * Math.sin(z / 1.7));
		return {
			depthsCm,
			targetDb,
			usableDepthCm: usableCm,
			bank: bank(count),
			displayDepthCm: depthCm,
			master: {minDb: 0, maxDb: 60},
		};
	};

	it('leave a fit the same whatever fits ran before it (smaller, larger, other slider counts)', () => {
		const small = request(6, 8, 80, 7);
		const large = request(10, 24, 480, 20);
		const first = fitSliders(small);
		const firstLarge = fitSliders(large);
		// Again in another order, after fits of other sizes have grown and dirtied every array.
		fitSliders(request(4, 12, 60, 12));
		expect(fitSliders(large)).toEqual(firstLarge);
		expect(fitSliders(small)).toEqual(first);
		expect(fitSliders(large)).toEqual(firstLarge);
	});
});
