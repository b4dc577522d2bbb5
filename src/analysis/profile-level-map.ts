/**
 * What refine takes from a stored scanner profile besides the depth response (which the plan
 * itself carries once resolved with the profile): the measured grey map and the slider travel.
 */
import {tableLevelMap, type LevelMap} from './level-map.js';

export interface ProfileReading {
	readonly levelMap: LevelMap;
	/** dB one slider's full travel adds; null when the profile did not measure it. */
	readonly sliderTravelDb: number | null;
}

/** The parts of a stored scanner profile read here (described structurally: calibration is a sibling folder). */
export interface ProfileForReading {
	readonly id: string;
	readonly label: string;
	readonly greyMap: readonly {readonly grey: number; readonly levelDb: number}[];
	readonly sliderTravelDb: number | null;
}

export function profileReading(profile: ProfileForReading): ProfileReading {
	return {
		levelMap: tableLevelMap(profile.greyMap, `grey map measured on "${profile.label}" (scanner profile ${profile.id})`),
		sliderTravelDb: profile.sliderTravelDb,
	};
}
