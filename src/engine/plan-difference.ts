/**
 * Per-slider differences between two fitted plans (a patient against a region's standard habitus,
 * or against a department's usual settings), so the operator sees what to move from where.
 */
import type {SliderFit} from './types.js';

export interface GainSettings {
	readonly masterGainDb: number;
	/** One value per slider, shallow to deep. */
	readonly slidersDb: readonly number[];
}

export interface SettingsDelta {
	readonly masterDeltaDb: number;
	/** patient − reference, per slider. */
	readonly sliderDeltasDb: readonly number[];
	/** Difference of the applied gain (master + slider) at each knot. */
	readonly totalDeltasDb: readonly number[];
}

export function settingsOf(fit: SliderFit): GainSettings {
	return {masterGainDb: fit.masterGainDb, slidersDb: fit.sliders.map((s) => s.gainDb)};
}

/** Differences of two settings with the same slider count; throws if the counts differ. */
export function settingsDelta(patient: GainSettings, reference: GainSettings): SettingsDelta {
	if (patient.slidersDb.length !== reference.slidersDb.length) {
		throw new RangeError(`slider counts differ (${patient.slidersDb.length} vs ${reference.slidersDb.length})`);
	}
	const sliderDeltasDb = patient.slidersDb.map((s, k) => s - reference.slidersDb[k]!);
	const masterDeltaDb = patient.masterGainDb - reference.masterGainDb;
	return {masterDeltaDb, sliderDeltasDb, totalDeltasDb: sliderDeltasDb.map((d) => d + masterDeltaDb)};
}
