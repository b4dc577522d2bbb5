/** The settings file of `refine --applied`, checked against the plan's slider bank and master range. */
import {describe, expect, it} from 'vitest';
import {parseAppliedSettings} from '../../src/plan/applied-settings.js';
import {scenarioPlan} from '../helpers/refine-scenario.js';

const plan = scenarioPlan();

describe('applied settings', () => {
	it('accepts one value per slider within range and a master within range', () => {
		const r = parseAppliedSettings({sliders: [0, 1, 2, 3, 4, 5, 6, 7], masterGainDb: 30}, plan);
		expect(r.ok).toBe(true);
	});
	it('names the slider count when it differs from the plan', () => {
		const r = parseAppliedSettings({sliders: [0, 0, 0], masterGainDb: 30}, plan);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors[0]).toMatch(/sliders: has 3 values; the plan's slider bank has 8/);
	});
	it('names a slider or master outside its range, and unknown keys', () => {
		const r = parseAppliedSettings({sliders: [0, 0, 0, 0, 0, 0, 0, 40], masterGainDb: 90}, plan);
		expect(r.ok).toBe(false);
		if (!r.ok) {
			expect(r.errors.join('\n')).toMatch(/sliders\.7: 40 dB is outside the plan's slider range -15 to 15 dB/);
			expect(r.errors.join('\n')).toMatch(/masterGainDb: 90 dB is outside the plan's master gain range 0 to 60 dB/);
		}
		const u = parseAppliedSettings({sliders: [0, 0, 0, 0, 0, 0, 0, 0], masterGainDb: 30, gain: 1}, plan);
		expect(u.ok).toBe(false);
		if (!u.ok) expect(u.errors[0]).toMatch(/unknown field "gain"/);
	});
});
