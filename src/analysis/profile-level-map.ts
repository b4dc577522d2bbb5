/**
 * What refine takes from a stored scanner profile besides the depth response (which the plan
 * itself carries once resolved with the profile): the measured grey map and the slider travel.
 */
import type {ScannerProfile} from '../calibration/profile-document.js';
import {tableLevelMap, type LevelMap} from './level-map.js';

export interface ProfileReading {
	readonly levelMap: LevelMap;
	/** dB one slider's full travel adds; null when the profile did not measure it. */
	readonly sliderTravelDb: number | null;
}

export function profileReading(profile: ScannerProfile): ProfileReading {
	return {
		levelMap: tableLevelMap(profile.greyMap, `grey map measured on "${profile.label}" (scanner profile ${profile.id})`),
		sliderTravelDb: profile.sliderTravelDb,
	};
}
