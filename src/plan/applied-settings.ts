/**
 * The settings file for `refine --applied` (`SETTINGS.json`): the sliders and master gain an image
 * was taken with, `{ "sliders": [dB, …], "masterGainDb": x }`, the master on the scanner's displayed
 * scale. Checked here against the plan's slider bank and master range.
 */
import {z} from 'zod';
import type {EnginePlan} from '../engine/types.js';
import {formatIssues, type ParseResult} from './plan-schema.js';

const settingsSchema = z.strictObject(
	{
		sliders: z.array(z.number({error: 'must be a number (dB)'}), {error: 'must be a list of slider values in dB'}),
		masterGainDb: z.number({error: 'must be a number (dB)'}),
	},
	{error: 'must be a JSON object with "sliders" and "masterGainDb"'},
);

export interface AppliedSettingsDocument {
	readonly sliders: readonly number[];
	readonly masterGainDb: number;
}

/** Parses and checks settings against the plan: one value per slider, each within its range. */
export function parseAppliedSettings(input: unknown, plan: EnginePlan): ParseResult<AppliedSettingsDocument> {
	const r = settingsSchema.safeParse(input);
	if (!r.success) return {ok: false, errors: formatIssues(r.error).map((e) => e.replace('(plan)', '(settings)'))};
	const errors: string[] = [];
	const {count, minDb, maxDb} = plan.sliders;
	if (r.data.sliders.length !== count) {
		errors.push(`sliders: has ${r.data.sliders.length} values; the plan's slider bank has ${count} (sliders.count)`);
	}
	r.data.sliders.forEach((v, k) => {
		if (v < minDb || v > maxDb)
			errors.push(`sliders.${k}: ${v} dB is outside the plan's slider range ${minDb} to ${maxDb} dB`);
	});
	const {minDb: mLo, maxDb: mHi} = plan.masterGain;
	if (r.data.masterGainDb < mLo || r.data.masterGainDb > mHi) {
		errors.push(`masterGainDb: ${r.data.masterGainDb} dB is outside the plan's master gain range ${mLo} to ${mHi} dB`);
	}
	return errors.length ? {ok: false, errors} : {ok: true, value: r.data};
}
