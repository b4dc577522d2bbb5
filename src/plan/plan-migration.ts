/**
 * Reading older plan files. `evenecho-plan/1` took every thickness as true (physical) thickness;
 * `evenecho-plan/2` lets each layer say whether its thickness was measured on the screen
 * (`thicknessAs: "displayed"`) and adds a target that follows a layer and a measured α0. A /1 file
 * keeps its meaning: each layer is marked `"true"` and nothing else changes.
 */

/** The format a /1 file is migrated to (kept here, not imported, to avoid an import cycle). */
const currentFormat = 'evenecho-plan/2';
export const planFormatV1 = 'evenecho-plan/1';

function isRecord(x: unknown): x is Record<string, unknown> {
	return typeof x === 'object' && x !== null && !Array.isArray(x);
}

/**
 * A /1 plan rewritten as /2 with the same meaning; anything else (a /2 plan, a plan without a
 * format, not an object at all) is returned untouched for the schema to judge.
 */
export function migratePlanV1(input: unknown): unknown {
	if (!isRecord(input) || input['format'] !== planFormatV1) return input;
	const layers = Array.isArray(input['layers'])
		? input['layers'].map((l) => (isRecord(l) && !('thicknessAs' in l) ? {...l, thicknessAs: 'true'} : l))
		: input['layers'];
	return {...input, format: currentFormat, layers};
}

/**
 * `probe.harmonic` (true: out at f0, back at 2·f0), in /1 and /2 files alike, becomes
 * `probe.receive`. `true` maps to `tissue-harmonic`: the old flag was meant for tissue harmonic
 * imaging, which the old model described poorly. A noise budget or phantom calibration given in
 * such a plan was meant for that receive mode, so it is marked so. A non-boolean flag is left for
 * the schema to refuse.
 */
export function migrateHarmonicFlag(input: unknown): unknown {
	if (!isRecord(input) || !isRecord(input['probe'])) return input;
	const probe = input['probe'];
	if (typeof probe['harmonic'] !== 'boolean' || 'receive' in probe) return input;
	const {harmonic, ...rest} = probe;
	const out: Record<string, unknown> = {...input, probe: harmonic ? {...rest, receive: 'tissue-harmonic'} : rest};
	if (harmonic) {
		const cal = input['phantomCalibration'];
		if (isRecord(cal) && !('receive' in cal)) out['phantomCalibration'] = {...cal, receive: 'tissue-harmonic'};
		if (input['noiseBudgetDb'] !== undefined && !('noiseBudgetReceive' in input))
			out['noiseBudgetReceive'] = 'tissue-harmonic';
	}
	return out;
}

/** Every migration step, oldest first: what the plan schema reads. */
export function migratePlanInput(input: unknown): unknown {
	return migrateHarmonicFlag(migratePlanV1(input));
}
