/** Simplifications of the model that every output using them must state, in one place. */

import type {ReceiveMode} from './types.js';

/** Stated wherever the scatterer-generated harmonic (contrast agents) is used. */
export const scattererHarmonicNote =
	'Scatterer harmonic (contrast agents): transmit at f0, the scatterer answers at 2·f0; ' +
	'the outward path is attenuated at f0 and the return path at 2·f0. Not a model of tissue ' +
	'harmonic imaging.';

/** Stated wherever tissue-harmonic receive is used. */
export const tissueHarmonicNote =
	'Tissue harmonic: the 2·f0 harmonic builds up along the way down (plane-wave ' +
	'quasi-linear model, Cobb 1983; B/A per tissue), so the near field is dark and the ' +
	'downward leg costs about 2·α(f0) per cm; levels are relative to the echo from 1 cm, the ' +
	'sliders are fitted from there down. Plane waves only: focusing reshapes the real depth ' +
	'profile, so confirm on the live image.';

/** The note a receive mode carries in every output, or null for fundamental. */
export function receiveModeNote(mode: ReceiveMode | undefined): string | null {
	return mode === 'tissue-harmonic' ? tissueHarmonicNote : mode === 'scatterer-harmonic' ? scattererHarmonicNote : null;
}

/** Kept for the outputs that state "the harmonic note": the tissue-harmonic one. */
export const harmonicSimplification = tissueHarmonicNote;

/** Stated with every penetration-per-frequency result. */
export const ladderSimplification =
	'The noise budget is taken as the same number of dB at every frequency (a simplification: real front ends vary across their band).';
