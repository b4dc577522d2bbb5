/**
 * Built-in tissue library: published speed of sound, density and one-way power-law attenuation
 * α(f) = α0·fⁿ (dB/cm, f in MHz) at 37 °C unless stated, with the literature spread used for the
 * uncertainty band.
 *
 * Each `source` names the primary references (author, year, table). "(from memory)" marks a value
 * that no source at hand verified; it stays marked wherever it is used. Reference keys:
 * - Duck 1990: Duck FA, Physical Properties of Tissue, Academic Press 1990 (Table 4.9 for saline).
 * - Szabo 2004: Szabo TL, Diagnostic Ultrasound Imaging: Inside Out, tissue tables.
 * - Hasgall 2018: IT'IS database v4.x, acoustic section (quoted via Park et al. 2023, J Biomed Opt 28(6), Table 7).
 * - Cardoso & Cowin 2012: Mech Mater 44:174–188, Table 3 (compiled ranges; author names from memory).
 * - Diagnostics 2023: Diagnostics (MDPI) 13(5):855, Table 4 (dB/cm at 1 MHz).
 * - Fernandes 2025: Bioengineering 12(9):946, Appendix A.1–A.2 (ex vivo).
 * - Sensors 2023: Sensors (MDPI) 23(13):5942, Table A2.
 * - Breast USCT 2016: numerical breast phantom, PMC5087608 Table I.
 * - Marczak 1997: J Acoust Soc Am 102:2776; Kell 1975: J Chem Eng Data 20:97.
 * - FDA 1985 / NEMA UD 2: regulatory in-situ tissue factors.
 * - Gooding: speed of sound in follicular fluid (journal and year from memory).
 * - Sun 2012: Ultrasound Med Biol 38(7) (IEC agar TMM); Browne 2003: Ultrasound Med Biol 29:1053.
 * - Madsen 1986: J Ultrasound Med 5:569 (inter-laboratory attenuation agreement ≈ 20 %).
 * - Lin 1988: Lin T, Ophir J, Potter G, Ultrasound Med Biol 14(8):729 (attenuation vs liver fat; from memory).
 * - Imbault 2017: Phys Med Biol 62:3582 (speed of sound falls with liver fat; from memory).
 */
import {nonlinearityById} from './nonlinearity.js';
import type {Tissue} from './types.js';

/** Every attenuation band is at least this wide either side (Madsen et al. 1986: labs agree to ~20 %). */
export const minimumAttenuationSpread = 0.2;

const library = {
	water: {
		label: 'Water, 20 °C',
		speedMps: 1482.4,
		densityKgM3: 998.2,
		alphaDbPerCmMhz: 0.00217,
		exponent: 2,
		source: 'c: Marczak 1997 polynomial; ρ: Kell 1975; α0: Szabo 2004 (f² law)',
		spread: {speedMps: [1482.4, 1523.7], densityKgM3: [993.3, 998.2], alphaDbPerCmMhz: [0.00139, 0.00217]},
	},
	'water-37': {
		label: 'Water, 37 °C',
		speedMps: 1523.7,
		densityKgM3: 993.3,
		alphaDbPerCmMhz: 0.00139,
		exponent: 2,
		source: 'c: Marczak 1997 polynomial; ρ: Kell 1975; α0: fit to Pinkerton 1949 data',
		spread: {alphaDbPerCmMhz: [0.00139, 0.00217]},
	},
	blood: {
		label: 'Blood (whole)',
		speedMps: 1578,
		densityKgM3: 1050,
		alphaDbPerCmMhz: 0.15,
		exponent: 1.2,
		source:
			'c, ρ: Hasgall 2018 via Park 2023 Table 7; α0: Diagnostics 2023 Table 4; n: Duck 1990 / Szabo 2004 (from memory)',
		spread: {speedMps: [1559, 1590], densityKgM3: [1025, 1060], alphaDbPerCmMhz: [0.14, 0.21], exponent: [1.1, 1.3]},
	},
	urine: {
		label: 'Urine (full bladder)',
		speedMps: 1534,
		densityKgM3: 1015,
		alphaDbPerCmMhz: 0.0014,
		exponent: 2,
		source:
			'c: 0.9 % saline proxy, Duck 1990 Table 4.9 (from memory for urine itself); ρ: clinical ' +
			'specific gravity (from memory); α: as water at 37 °C (from memory)',
		spread: {speedMps: [1520, 1550], densityKgM3: [1005, 1030], alphaDbPerCmMhz: [0.001, 0.006], exponent: [1, 2]},
	},
	'amniotic-fluid': {
		label: 'Amniotic fluid',
		speedMps: 1535,
		densityKgM3: 1007,
		alphaDbPerCmMhz: 0.006,
		exponent: 1,
		source: 'c, ρ: from memory; α0: FDA 1985 / NEMA UD 2 regulatory tissue factor',
		spread: {speedMps: [1520, 1550], densityKgM3: [1005, 1030], alphaDbPerCmMhz: [0.001, 0.006], exponent: [1, 2]},
	},
	'cyst-fluid': {
		label: 'Simple cyst fluid',
		speedMps: 1550,
		densityKgM3: 1010,
		alphaDbPerCmMhz: 0.0022,
		exponent: 2,
		source:
			'c: Gooding (follicular fluid, 1550 ± 3 m/s at 37.3 °C); ρ: from memory; α: water-like, Breast USCT 2016 Table I',
		spread: {speedMps: [1520, 1550], densityKgM3: [1005, 1030], alphaDbPerCmMhz: [0.001, 0.006], exponent: [1, 2]},
	},
	fat: {
		label: 'Fat (subcutaneous)',
		speedMps: 1440,
		densityKgM3: 911,
		alphaDbPerCmMhz: 0.6,
		exponent: 1,
		source:
			'c: in-vivo breast fat via Park 2023 Table 7; ρ: Hasgall 2018; α0: Breast USCT 2016 ' +
			'Table I (0.60), Diagnostics 2023 Table 4 (0.63); n: Szabo 2004 (from memory)',
		spread: {speedMps: [1412, 1488], densityKgM3: [812, 961], alphaDbPerCmMhz: [0.38, 0.8], exponent: [1, 1.3]},
	},
	skin: {
		label: 'Skin (dermis)',
		speedMps: 1610,
		densityKgM3: 1090,
		alphaDbPerCmMhz: 0.4,
		exponent: 1,
		source:
			'c: within Cardoso & Cowin 2012 Table 3 (1595–1635); ρ, n: from memory; α0: Aubry 2022 benchmark (secondary)',
		spread: {speedMps: [1530, 1730], densityKgM3: [1090, 1131], alphaDbPerCmMhz: [0.35, 1.84]},
	},
	'soft-tissue': {
		label: 'Generic soft tissue',
		speedMps: 1540,
		densityKgM3: 1060,
		alphaDbPerCmMhz: 0.5,
		exponent: 1,
		source:
			'c: scanner convention (common practice, no source); ρ: ICRU 44 (from memory); α0: IEC ' +
			'61391-2 phantom/soft-tissue average 0.5 dB/cm/MHz (secondary)',
		spread: {speedMps: [1500, 1600], densityKgM3: [1040, 1070], alphaDbPerCmMhz: [0.3, 1], exponent: [1, 1.2]},
	},
	liver: {
		label: 'Liver',
		speedMps: 1578,
		densityKgM3: 1060,
		alphaDbPerCmMhz: 0.5,
		exponent: 1.1,
		source:
			'c: Szabo 2004 / Duck 1990 (from memory); ρ: Cardoso & Cowin 2012 Table 3; α0: Diagnostics 2023 Table 4; n: from memory',
		spread: {speedMps: [1540, 1635], densityKgM3: [1060, 1084], alphaDbPerCmMhz: [0.43, 0.7], exponent: [1, 1.2]},
	},
	'steatotic-liver': {
		label: 'Liver, steatotic (fatty)',
		speedMps: 1530,
		densityKgM3: 1040,
		alphaDbPerCmMhz: 0.8,
		exponent: 1.1,
		source:
			'α0 range: Lin, Ophir & Potter 1988 (Ultrasound Med Biol 14(8):729, attenuation rises ' +
			'with histological fat; values from memory) and later scanner attenuation studies with ' +
			'cut-offs of about 0.6–0.7 dB/cm/MHz (from memory, unverified); c: lower than normal ' +
			'liver, Imbault et al. 2017 (Phys Med Biol 62:3582; values from memory); ρ, n: from ' +
			'memory',
		spread: {speedMps: [1490, 1570], densityKgM3: [1020, 1060], alphaDbPerCmMhz: [0.62, 1], exponent: [1, 1.2]},
	},
	kidney: {
		label: 'Kidney',
		speedMps: 1560,
		densityKgM3: 1050,
		alphaDbPerCmMhz: 1,
		exponent: 1,
		source:
			'c: from memory (Fernandes 2025: 1557 ± 17); ρ: Cardoso & Cowin 2012 Table 3; α0: Diagnostics 2023 Table 4; n: from memory',
		spread: {speedMps: [1530, 1590], densityKgM3: [1050, 1057], alphaDbPerCmMhz: [0.79, 1]},
	},
	spleen: {
		label: 'Spleen',
		speedMps: 1567,
		densityKgM3: 1054,
		alphaDbPerCmMhz: 0.4,
		exponent: 1.3,
		source:
			'c: Duck 1990 / Szabo 2004 (from memory); ρ: Cardoso & Cowin 2012 Table 3; α0: Diagnostics 2023 Table 4; n: Szabo 2004 (from memory)',
		spread: {speedMps: [1537, 1597], alphaDbPerCmMhz: [0.4, 0.6], exponent: [1, 1.3]},
	},
	muscle: {
		label: 'Skeletal muscle (across fibres)',
		speedMps: 1580,
		densityKgM3: 1050,
		alphaDbPerCmMhz: 0.96,
		exponent: 1,
		source:
			'c: Sensors 2023 Table A2; ρ: Cardoso & Cowin 2012 Table 3; α0: Diagnostics 2023 Table ' +
			'4; n ≈ 1: bovine muscle study (Shore et al., from memory)',
		spread: {speedMps: [1517, 1600], densityKgM3: [1050, 1090], alphaDbPerCmMhz: [0.55, 0.96]},
	},
	'muscle-along': {
		label: 'Skeletal muscle (along fibres)',
		speedMps: 1580,
		densityKgM3: 1050,
		alphaDbPerCmMhz: 1.4,
		exponent: 1,
		source: 'as muscle; α0: Diagnostics 2023 Table 4 (1.3 in the bovine muscle study)',
		spread: {speedMps: [1560, 1630], densityKgM3: [1050, 1090], alphaDbPerCmMhz: [1.3, 1.4]},
	},
	breast: {
		label: 'Breast (glandular)',
		speedMps: 1540,
		densityKgM3: 1041,
		alphaDbPerCmMhz: 0.75,
		exponent: 1.5,
		source:
			'c: in-vivo tomography via Park 2023 Table 7; ρ, α0: Hasgall 2018 (also Breast USCT 2016 ' +
			'Table I); n: Szabo 2004 (from memory; 1.12–1.36 in Li 2022)',
		spread: {speedMps: [1490, 1567], densityKgM3: [990, 1092], alphaDbPerCmMhz: [0.67, 0.83], exponent: [1.1, 1.5]},
	},
	brain: {
		label: 'Brain',
		speedMps: 1546,
		densityKgM3: 1046,
		alphaDbPerCmMhz: 0.59,
		exponent: 1.2,
		source: 'c: within Cardoso & Cowin 2012 Table 3; ρ, α0, n: uncited default set (from memory); FDA 1985 factor 0.53',
		spread: {speedMps: [1540, 1580], densityKgM3: [1024, 1047], alphaDbPerCmMhz: [0.53, 0.6], exponent: [1.2, 1.3]},
	},
	tendon: {
		label: 'Tendon / ligament',
		speedMps: 1750,
		densityKgM3: 1142,
		alphaDbPerCmMhz: 1.26,
		exponent: 1,
		source: 'c: midpoint of Cardoso & Cowin 2012 Table 3 range; ρ, α0: Hasgall 2018 "ligament"; n: from memory',
		spread: {speedMps: [1654, 1852], densityKgM3: [1110, 1175], alphaDbPerCmMhz: [1.26, 1.57]},
	},
	cartilage: {
		label: 'Cartilage (articular)',
		speedMps: 1630,
		densityKgM3: 1100,
		alphaDbPerCmMhz: 1.5,
		exponent: 1,
		source: 'c: Patil et al. 2004 (1626 ± 86); ρ: from memory; α0, n: placeholder (from memory, no verified value)',
		spread: {speedMps: [1507, 1834], densityKgM3: [1033, 1100], alphaDbPerCmMhz: [1, 5]},
	},
	'cortical-bone': {
		label: 'Cortical bone',
		speedMps: 3500,
		densityKgM3: 1900,
		alphaDbPerCmMhz: 13.3,
		exponent: 1,
		source:
			'c, ρ: within Cardoso & Cowin 2012 Table 3; α0: Pinton et al. 2012 skull bulk value ' +
			'(secondary; 15 in Diagnostics 2023 Table 4); n: from memory',
		spread: {speedMps: [2800, 4000], densityKgM3: [1800, 2200], alphaDbPerCmMhz: [1, 20]},
	},
	'trabecular-bone': {
		label: 'Trabecular bone',
		speedMps: 2300,
		densityKgM3: 1700,
		alphaDbPerCmMhz: 20,
		exponent: 1,
		source: 'c: within Cardoso & Cowin 2012 Table 3 and Fernandes 2025; ρ: Pichardo 2011 (secondary); α0: from memory',
		spread: {speedMps: [1500, 2400], densityKgM3: [400, 1740], alphaDbPerCmMhz: [10, 40]},
	},
	lung: {
		label: 'Lung (inflated)',
		speedMps: 650,
		densityKgM3: 400,
		alphaDbPerCmMhz: 40,
		exponent: 1,
		source: 'c, ρ: Duck 1990 (from memory); α0: Diagnostics 2023 Table 4; poorly established',
		spread: {speedMps: [300, 700], densityKgM3: [300, 500], alphaDbPerCmMhz: [20, 40]},
	},
	air: {
		label: 'Air (dry, 20 °C)',
		speedMps: 343.2,
		densityKgM3: 1.204,
		alphaDbPerCmMhz: 1.6,
		exponent: 2,
		source:
			'c, ρ: ideal gas (computed; γ and molar mass from memory); α0: ISO 9613-1 classical term (formula from memory)',
		spread: {speedMps: [331, 349], densityKgM3: [1.16, 1.29], alphaDbPerCmMhz: [1.6, 12]},
	},
	phantom: {
		label: 'Tissue-mimicking phantom (0.5 grade)',
		speedMps: 1540,
		densityKgM3: 1050,
		alphaDbPerCmMhz: 0.5,
		exponent: 1,
		source:
			'IEC 61391 / IEC 61685 phantom targets 1540 m/s, 0.5 dB/cm/MHz (from memory; measured ' +
			'agar TMM: Sun 2012, 1547 m/s, linear in f: Browne 2003); ρ: from memory',
		spread: {speedMps: [1525, 1555], alphaDbPerCmMhz: [0.45, 0.55]},
	},
	'phantom-07': {
		label: 'Tissue-mimicking phantom (0.7 grade)',
		speedMps: 1540,
		densityKgM3: 1050,
		alphaDbPerCmMhz: 0.7,
		exponent: 1,
		source: 'common QA-phantom grade (from memory)',
		spread: {speedMps: [1525, 1555], alphaDbPerCmMhz: [0.65, 0.75]},
	},
} satisfies Record<string, Omit<Tissue, 'id'>>;

export type TissueId = keyof typeof library;

/** Every library id, in display order. */
export const tissueIds = Object.keys(library) as TissueId[];

/** Look up a library tissue by id; undefined when the id is unknown. */
export function libraryTissue(id: string): Tissue | undefined {
	if (!Object.hasOwn(library, id)) return undefined;
	return withNonlinearity(id as TissueId);
}

/** A library record with its B/A and the B/A's source (nonlinearity.ts). */
function withNonlinearity(id: TissueId): Tissue {
	const n = nonlinearityById[id];
	return {id, ...library[id], ...(n ? {nonlinearityBA: n.ba, nonlinearitySource: n.source} : {})};
}

/** All library tissues with their ids. */
export function allLibraryTissues(): Tissue[] {
	return tissueIds.map(withNonlinearity);
}

/** Acoustic impedance Z = ρ·c, MRayl. */
export function impedanceMrayl(t: Pick<Tissue, 'speedMps' | 'densityKgM3'>): number {
	return (t.speedMps * t.densityKgM3) / 1e6;
}
