/**
 * The console's `refine` effect: read the named still (the image reader is the only code that
 * reads image files), measure it against the plan as it stands, through the scanner profile the
 * plan names when it names one. Bad input becomes a message naming the problem, never an exception.
 */
import {frameFromImage} from '../../analysis/frame-from-image.js';
import {profileReading} from '../../analysis/profile-level-map.js';
import {refineImage} from '../../analysis/refine-image.js';
import type {AppliedSettings} from '../../analysis/applied-gain.js';
import type {EnginePlan} from '../../engine/types.js';
import {maxPlanBytes, readRegularFile} from '../../files/bounded-read.js';
import {parseStrictJson} from '../../files/strict-json.js';
import {parseAppliedSettings} from '../../plan/applied-settings.js';
import {scannerResponseOf} from '../../calibration/profile-document.js';
import {readImageFile} from '../../image/read-image.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {resolvePlan} from '../../plan/resolve-plan.js';
import {openScannerProfileStore} from '../../store/scanner-profile-store.js';
import type {Action} from '../state/console-reducer.js';

const messageOf = (e: unknown) => (e instanceof Error ? e.message : String(e));

/** The stated settings file, read and checked against the plan's slider count. */
function statedSettings(path: string, plan: EnginePlan): AppliedSettings | string {
	try {
		const {bytes} = readRegularFile(path, {maxBytes: maxPlanBytes, what: 'settings file'});
		const json = parseStrictJson(bytes.toString('utf8').replace(/^\uFEFF/, ''));
		if (!json.ok) return `${path}: ${json.problem}`;
		const s = parseAppliedSettings(json.value, plan);
		if (!s.ok) return `${path}: not valid settings for this plan (${s.errors[0]})`;
		return {slidersDb: [...s.value.sliders], masterGainDb: s.value.masterGainDb};
	} catch (error) {
		return messageOf(error);
	}
}

export function refineStill(doc: PlanDocument, path: string, frame: number | undefined, settingsPath?: string): Action {
	let still;
	try {
		still = readImageFile(path, frame === undefined ? {} : {frame});
	} catch (error) {
		return {type: 'refine-failed', problem: messageOf(error)};
	}
	let reading;
	let plan = resolvePlan(doc);
	if (doc.scanner !== undefined) {
		try {
			const profile = openScannerProfileStore().get(doc.scanner);
			plan = resolvePlan(doc, scannerResponseOf(profile));
			reading = profileReading(profile);
		} catch (error) {
			return {type: 'refine-failed', problem: `the plan's scanner: ${messageOf(error)}`};
		}
	}
	let applied: AppliedSettings | undefined;
	if (settingsPath) {
		const stated = statedSettings(settingsPath, plan);
		if (typeof stated === 'string') return {type: 'refine-failed', problem: stated};
		applied = stated;
	}
	try {
		const {frame: grey, region} = frameFromImage(still);
		const outcome = refineImage({
			frame: grey,
			region,
			plan,
			...(applied ? {applied} : {}),
			...(reading ? {levelMap: reading.levelMap, sliderTravelDb: reading.sliderTravelDb} : {}),
		});
		if (!outcome.ok) return {type: 'refine-failed', problem: outcome.problem};
		return {type: 'refined', still, result: outcome};
	} catch (error) {
		return {type: 'refine-failed', problem: `could not be measured: ${messageOf(error)}`};
	}
}
