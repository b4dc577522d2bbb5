/**
 * The cautions printed with every output. The tool changes receive gain only; these lines say what
 * that means for the patient (AIUM ALARA statement 2020; AIUM Medical Ultrasound Safety 3rd ed. 2014;
 * BMUS safety guidelines 2009).
 */

/** One line for tables and headers. */
export const cautionLine =
	'Starting point only, not a diagnosis: confirm on the live image. Receive gain before ' +
	'transmit output (ALARA); local protocols and licensed practice decide.';

/** The full set, for summaries and help. */
export const cautions: readonly string[] = [
	'A starting point for a qualified operator, not a diagnosis or a prescription: confirm it on the live image.',
	'Adjust receive gain (TGC, master gain) before transmit output. Gain does not change ' +
		'patient exposure; output does. Keep output As Low As Reasonably Achievable (ALARA) and ' +
		'watch MI/TI.',
	'Gain cannot raise the signal-to-noise ratio: below the noise floor it only brightens ' +
		'noise. Over-gain can hide pathology or mimic fluid or sludge.',
	'Model: 1-D parallel layers (no focus or diffraction), homogeneous tissue, published ' +
		'tissue values with roughly ±20 % spread. Local protocols, department presets, ' +
		'manufacturer instructions and licensed practice take precedence.',
];
