/** Simplifications of the model that every output using them must state, in one place. */

/** Stated wherever harmonic receive is used. */
export const harmonicSimplification =
	'Harmonic receive: transmit at f0, receive at 2·f0; the outward path is attenuated at f0 and the return path at 2·f0. Simplification: the harmonic is taken as present from the skin; its build-up with depth is not modelled.';

/** Stated with every penetration-per-frequency result. */
export const ladderSimplification =
	'The noise budget is taken as the same number of dB at every frequency (a simplification: real front ends vary across their band).';
