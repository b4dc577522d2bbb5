/**
 * The acoustic nonlinearity parameter B/A of each library tissue, which sets how fast the tissue
 * harmonic builds up (coefficient of nonlinearity β = 1 + B/(2A)).
 *
 * Sources: a review abstract of Dunn's measurements (J Acoust Soc Am 2006; verified only through a
 * secondary source) gives about 7 for liver, muscle and brain and about 11 for fat. Finer values
 * are from memory (Duck 1990, Physical Properties of Tissue; Law, Frizzell & Dunn 1985, Ultrasound
 * Med Biol 11:307) and are marked so. Where no value is known the soft-tissue default stands in.
 */
import type {Tissue} from './types.js';

/** Soft-tissue B/A for tissues without a value (custom tissues too): about 7 for liver, muscle and
 * brain (review abstract of Dunn's measurements, J Acoust Soc Am 2006, secondary source). */
export const softTissueNonlinearityBA = 7;

export interface NonlinearityEntry {
	readonly ba: number;
	readonly source: string;
}

const review = "review abstract of Dunn's measurements, J Acoust Soc Am 2006 (secondary source)";
const fallback = `soft-tissue default ${softTissueNonlinearityBA} (${review}); no value of its own`;

/** B/A per library tissue id. */
export const nonlinearityById: Readonly<Record<string, NonlinearityEntry>> = {
	water: {ba: 5.0, source: 'Duck 1990 (from memory)'},
	'water-37': {ba: 5.4, source: 'Duck 1990 (from memory)'},
	blood: {ba: 6.1, source: 'Duck 1990 (from memory)'},
	urine: {ba: 5.4, source: 'as water at 37 °C (from memory)'},
	'amniotic-fluid': {ba: 5.4, source: 'as water at 37 °C (from memory)'},
	'cyst-fluid': {ba: 5.4, source: 'as water at 37 °C (from memory)'},
	fat: {ba: 10, source: `about 11: ${review}; 9.6–11: Duck 1990 (from memory)`},
	skin: {ba: softTissueNonlinearityBA, source: fallback},
	'soft-tissue': {ba: softTissueNonlinearityBA, source: review},
	liver: {ba: 6.8, source: `about 7: ${review}; 6.5–7.6: Duck 1990 (from memory)`},
	kidney: {ba: 7.4, source: 'Duck 1990 (from memory)'},
	spleen: {ba: 7.8, source: 'Duck 1990 (from memory)'},
	muscle: {ba: 7.4, source: `about 7: ${review}; 7.4: Duck 1990 (from memory)`},
	'muscle-along': {ba: 7.4, source: `about 7: ${review}; 7.4: Duck 1990 (from memory)`},
	breast: {ba: 9.6, source: 'Duck 1990, fatty breast (from memory)'},
	brain: {ba: 6.6, source: `about 7: ${review}; 6.6: Duck 1990 (from memory)`},
	tendon: {ba: softTissueNonlinearityBA, source: fallback},
	cartilage: {ba: softTissueNonlinearityBA, source: fallback},
	'cortical-bone': {ba: softTissueNonlinearityBA, source: `${fallback}; no echo returns beyond bone anyway`},
	'trabecular-bone': {ba: softTissueNonlinearityBA, source: `${fallback}; no echo returns beyond bone anyway`},
	lung: {ba: softTissueNonlinearityBA, source: `${fallback}; no echo returns beyond lung anyway`},
	air: {ba: 0.4, source: 'ideal gas: B/A = γ − 1 = 0.4 (computed)'},
	phantom: {ba: softTissueNonlinearityBA, source: `${fallback}; tissue-mimicking gels vary (from memory)`},
	'phantom-07': {ba: softTissueNonlinearityBA, source: `${fallback}; tissue-mimicking gels vary (from memory)`},
};

/** B/A of a tissue: its own value, its library value, or the soft-tissue default. */
export function nonlinearityOf(t: Tissue): number {
	return t.nonlinearityBA ?? (t.id ? nonlinearityById[t.id]?.ba : undefined) ?? softTissueNonlinearityBA;
}

/** Coefficient of nonlinearity β = 1 + B/(2A). */
export function betaOf(t: Tissue): number {
	return 1 + nonlinearityOf(t) / 2;
}
