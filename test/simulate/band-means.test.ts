/**
 * The picture's band means follow the model: each 1 cm band's mean grey is what the display map
 * gives for the band's mean echo-plus-noise level (speckle integrated over its exponential
 * intensity); the plan's sliders flatten a thick-fat plan; below the noise floor and below a barrier
 * only noise shows. Plans are invented test stacks.
 */
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {demoPlanJson} from '../../src/plan/demo-plan.js';
import {parsePlan} from '../../src/plan/resolve-plan.js';
import {meanGreyOfSpeckle} from '../../src/simulate/display-map.js';
import {createPictureCache} from '../../src/simulate/plan-picture.js';
import {settingsOfFit} from '../../src/simulate/row-gains.js';
import {plainScanner, realisticScanner} from '../../src/simulate/scanner-behaviour.js';
import {simulateFrame, type SimulatedFrame} from '../../src/simulate/simulate-frame.js';
import {boneAndNoisePlanJson} from '../fixtures/plans.js';
import {matched, plan} from '../helpers/plans.js';

function engineOf(json: unknown) {
	const r = parsePlan(structuredClone(json));
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value.plan;
}

/** Mean grey of rows [from, to) of a width-wide picture. */
function bandMean(grey: Uint8Array, width: number, from: number, to: number): number {
	let s = 0;
	for (let i = from * width; i < to * width; i++) s += grey[i]!;
	return s / ((to - from) * width);
}

/** The tissue image of a framed picture. */
function cropRegion(f: SimulatedFrame): Uint8Array {
	const w = f.region.x1 - f.region.x0 + 1;
	const out = new Uint8Array(w * (f.region.y1 - f.region.y0 + 1));
	for (let y = f.region.y0; y <= f.region.y1; y++)
		out.set(f.grey.subarray(y * f.width + f.region.x0, y * f.width + f.region.x1 + 1), (y - f.region.y0) * w);
	return out;
}

const width = 300;
const height = 320;

describe('band means follow the model', () => {
	it(
		'uniform speckle at 0 dB on a 60 dB map, top 28 dB: mean grey 125.3, SD 23.7 (shared ' +
			'derivation C45: 255·(L − 2.507 − top + DR)/DR and 5.57·255/DR, Kaplan & Ma 1994)',
		() => {
			const p = plan([{tissue: matched('lossless scatterer', 1540, 0), thicknessCm: 100}], {bandwidthFraction: 0.6});
			const f = simulateFrame({plan: p, width: 600, height: 480, seed: 5});
			let s = 0;
			let s2 = 0;
			for (const g of f.grey) {
				s += g;
				s2 += g * g;
			}
			const mean = s / f.grey.length;
			const sd = Math.sqrt(s2 / f.grey.length - mean * mean);
			expect(mean).toBeCloseTo(125.3, 0);
			expect(Math.abs(sd - 23.7)).toBeLessThan(0.4);
		},
	);

	it("each 1 cm band's mean grey is the display map of its true mean level (plain and realistic scanner)", () => {
		const p = engineOf(demoPlanJson);
		const realistic = realisticScanner(p);
		const framed = simulateFrame({plan: p, width, height, seed: 9, scanner: realistic});
		for (const [scannerKind, scanner, f] of [
			['plain', plainScanner(p), simulateFrame({plan: p, width, height, seed: 9})],
			[
				'plain, plan settings',
				plainScanner(p),
				simulateFrame({plan: p, width, height, seed: 9, settings: settingsOfFit(computeCurve(p).fit)}),
			],
			['realistic (non-log map, smoothed)', realistic, {...framed, grey: cropRegion(framed)}],
		] as const) {
			const rowsPerCm = height / p.display.depthCm;
			for (let cm = 0; cm < p.display.depthCm; cm++) {
				const from = Math.round(cm * rowsPerCm);
				const to = Math.round((cm + 1) * rowsPerCm);
				let expected = 0;
				for (let r = from; r < to; r++) expected += meanGreyOfSpeckle(scanner.display, f.truth.meanLevelDb[r]!);
				expected /= to - from;
				// SD of a band mean: 23.7 grey / √(cells); a band here holds > 1,000 cells → 0.75 grey; ~4 SE.
				expect(
					Math.abs(bandMean(f.grey, width, from, to) - expected),
					`${scannerKind}, ${cm}–${cm + 1} cm`,
				).toBeLessThan(3);
			}
		}
	});

	it("with the plan's sliders a thick-fat deep plan shows flatter band means than with the built-in ramp alone", () => {
		const result = computeCurve(engineOf(demoPlanJson));
		const pics = createPictureCache(3).pictures(result, width, height);
		const rowsPerCm = height / result.plan.display.depthCm;
		const spread = (grey: Uint8Array) => {
			const means: number[] = [];
			for (let cm = 1; cm < Math.floor(result.usableDepthCm); cm++)
				means.push(bandMean(grey, width, Math.round(cm * rowsPerCm), Math.round((cm + 1) * rowsPerCm)));
			return Math.max(...means) - Math.min(...means);
		};
		expect(spread(pics.plan)).toBeLessThan(spread(pics.ramp) / 2);
		expect(spread(pics.plan)).toBeLessThan(12);
	});

	it('below the noise floor only noise: the band mean level is the noise level, whatever the echo would have been', () => {
		const p = engineOf(boneAndNoisePlanJson);
		const result = computeCurve(p);
		const f = simulateFrame({plan: p, width, height, seed: 4, settings: settingsOfFit(result.fit)});
		const scanner = plainScanner(p);
		const rowsPerCm = height / p.display.depthCm;
		// The echo falls below the floor at ~6 cm and meets bone at 8 cm (the shared check plan).
		expect(result.penetrationDepthCm!).toBeLessThan(7);
		expect(f.truth.blockedDepthCm!).toBeGreaterThan(7.5);
		for (let r = 0; r < height; r++) {
			const d = f.truth.depthCm[r]!;
			const echoLevel = f.truth.lossDb[r] === null ? -Infinity : f.truth.gainDb[r]! - f.truth.lossDb[r]!;
			if (d > f.truth.blockedDepthCm!) {
				// Below a barrier: exactly the noise, no echo at all.
				expect(f.truth.lossDb[r]).toBeNull();
				expect(f.truth.meanLevelDb[r]).toBeCloseTo(f.truth.noiseLevelDb[r]!, 9);
			} else if (d > result.penetrationDepthCm! + 1) {
				expect(echoLevel).toBeLessThan(f.truth.noiseLevelDb[r]! - 3);
			}
		}
		const from = Math.round(9 * rowsPerCm);
		const to = Math.round(12 * rowsPerCm);
		let expected = 0;
		for (let r = from; r < to; r++) expected += meanGreyOfSpeckle(scanner.display, f.truth.noiseLevelDb[r]!);
		expected /= to - from;
		expect(Math.abs(bandMean(f.grey, width, from, to) - expected)).toBeLessThan(2);
	});
});

describe('determinism', () => {
	const p = engineOf(demoPlanJson);
	it('same seed, same bytes; another seed, other bytes (plain and realistic)', () => {
		for (const scanner of [plainScanner(p), realisticScanner(p)]) {
			const a = simulateFrame({plan: p, scanner, width: 120, height: 100, seed: 42});
			const b = simulateFrame({plan: p, scanner, width: 120, height: 100, seed: 42});
			const c = simulateFrame({plan: p, scanner, width: 120, height: 100, seed: 43});
			expect(Buffer.from(a.grey).equals(Buffer.from(b.grey))).toBe(true);
			expect(Buffer.from(a.grey).equals(Buffer.from(c.grey))).toBe(false);
		}
	});

	it('a realistic frame keeps burned-in graphics outside the image region and maps its rows to depth', () => {
		const f = simulateFrame({
			plan: p,
			scanner: realisticScanner(p),
			width: 200,
			height: 160,
			seed: 1,
			caption: 'TEST 30 DB',
		});
		expect(f.overlay).not.toBeNull();
		let inside = 0;
		let outside = 0;
		for (let y = 0; y < f.height; y++) {
			for (let x = 0; x < f.width; x++) {
				const lit = f.overlay![y * f.width + x]!;
				const inRegion = x >= f.region.x0 && x <= f.region.x1 && y >= f.region.y0 && y <= f.region.y1;
				if (lit && inRegion) inside++;
				if (lit && !inRegion) outside++;
			}
		}
		expect(inside).toBe(0);
		expect(outside).toBeGreaterThan(100);
		expect(f.rowsToDepth.topRowCm + f.region.y0 * f.rowsToDepth.cmPerRow).toBeCloseTo(0, 9);
		expect(f.region.y1 - f.region.y0 + 1).toBe(160);
	});
});
