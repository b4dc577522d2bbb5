/**
 * The console's `refine` effect: read the named still (the image reader is the only code that
 * reads image files), measure it against the plan as it stands, through the scanner profile the
 * plan names when it names one. Bad input becomes a message naming the problem, never an exception.
 */
import {frameFromImage} from '../../analysis/frame-from-image.js';
import {profileReading} from '../../analysis/profile-level-map.js';
import {refineImage} from '../../analysis/refine-image.js';
import {scannerResponseOf} from '../../calibration/profile-document.js';
import {readImageFile} from '../../image/read-image.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {resolvePlan} from '../../plan/resolve-plan.js';
import {openScannerProfileStore} from '../../store/scanner-profile-store.js';
import type {Action} from '../state/console-reducer.js';

const messageOf = (e: unknown) => (e instanceof Error ? e.message : String(e));

export function refineStill(doc: PlanDocument, path: string, frame: number | undefined): Action {
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
	try {
		const {frame: grey, region} = frameFromImage(still);
		const outcome = refineImage({frame: grey, region, plan, ...(reading ? {levelMap: reading.levelMap, sliderTravelDb: reading.sliderTravelDb} : {})});
		if (!outcome.ok) return {type: 'refine-failed', problem: outcome.problem};
		return {type: 'refined', still, result: outcome};
	} catch (error) {
		return {type: 'refine-failed', problem: `could not be measured: ${messageOf(error)}`};
	}
}
