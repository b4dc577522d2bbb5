/**
 * Refining without a scanner profile on the realistic simulated scanner (`simulate --kind patient`):
 * its own depth gain, focus and noise are not the plan's assumptions, and its noise sits well above
 * the plan's stated budget, so deep noise could pass as tissue. Each still is written as a file by
 * our own writers (DICOM, and PNG cropped to the tissue region with its pixel scale) and read back.
 *
 * The scenario is invented: the standard adult upper abdomen of the helpers' plan whose liver truly
 * attenuates 0.8 dB/cm/MHz against the plan's 0.5. The truth is the simulator's.
 *
 * What must hold: either the liver's true α0 lies inside the reported 95 % interval, or the output
 * says it cannot tell; and every output names what the uncalibrated assumptions (display range, ramp,
 * noise) can cost.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, describe, expect, it} from 'vitest';
import {frameFromImage} from '../../src/analysis/frame-from-image.js';
import {refineImage} from '../../src/analysis/refine-image.js';
import {parsePlan} from '../../src/plan/resolve-plan.js';
import {patientImage} from '../../src/simulate/demo-images.js';
import {abdomenPlanJson} from '../helpers/plans.js';
import {writtenAndRead} from '../helpers/patient-still.js';

const dir = mkdtempSync(join(tmpdir(), 'evenecho-uncalibrated-'));
afterAll(() => rmSync(dir, {recursive: true, force: true}));

const parsed = parsePlan(abdomenPlanJson({}, 0.5));
if (!parsed.ok) throw new Error(parsed.errors.join('; '));
const {plan} = parsed.value;
const size = {width: 360, height: 200};

describe('the demo patient refined without a scanner profile', () => {
	const runs = [1, 2, 3, 4, 5, 6].map((seed) => {
		const format = seed % 2 === 0 ? 'dicom' : 'png';
		const set = patientImage(plan, seed, format === 'dicom' ? 'dcm' : 'png', {
			size,
			cyst: seed % 3 === 1,
			brightLine: seed % 3 === 2,
		});
		const {frame, region} = frameFromImage(writtenAndRead(dir, plan.name, set, seed, format).image);
		const a = set.appliedSettings!;
		const out = refineImage({frame, region, plan, applied: {slidersDb: a.sliders, masterGainDb: a.masterGainDb}});
		if (!out.ok) throw new Error(`seed ${seed}: ${out.problem}`);
		return {seed, truth: set.truth['trueAlphaDbPerCmMhz'] as number, out};
	});

	it('either holds the true α0 in its interval or says it cannot tell', () => {
		for (const {seed, truth, out} of runs) {
			const a = out.attenuation;
			if (a) {
				expect(truth, `seed ${seed}`).toBeGreaterThanOrEqual(a.low);
				expect(truth, `seed ${seed}`).toBeLessThanOrEqual(a.high);
			} else {
				expect(out.cannotTell, `seed ${seed}`).toMatch(/cannot tell/);
				expect(out.warnings.find((w) => w.code === 'cannot-tell')?.message).toMatch(/Attenuation not measured/);
			}
		}
	});

	it("judges the noise from the image, not from the plan's budget, and says what that costs", () => {
		for (const {seed, out} of runs) {
			const u = out.uncalibrated!;
			// The simulated scanner's noise meets the echo well above the plan's budget: the image shows it.
			expect(u.imageNoiseBudgetDb, `seed ${seed}`).not.toBeNull();
			expect(u.imageNoiseBudgetDb!, `seed ${seed}`).toBeLessThan(u.planNoiseBudgetDb);
			const w = out.warnings.find((x) => x.code === 'uncalibrated')!.message;
			expect(w.split('. ')[0]).toMatch(
				/logarithmic display, the scanner's own depth gain as the assumed ramp .* and its noise/,
			);
			expect(w).toMatch(/noise level is itself an estimate/);
			// Bands deep in the noise are not used as tissue.
			expect(
				out.bands.filter((b) => b.depthCm > 13).every((b) => !b.usable),
				`seed ${seed}`,
			).toBe(true);
		}
	});
});
