/**
 * The machine-readable forms of a curve: JSON for other tools and CSV of the samples.
 */
import {stringify} from 'csv-stringify/sync';
import {modelVersion} from '../engine/compensation-curve.js';
import type {CurveResult} from '../engine/types.js';
import {bandScopeNote} from '../engine/uncertainty-band.js';
import {cautionLine} from './cautions.js';

const round = (x: number, digits = 3) => (Number.isFinite(x) ? Number(x.toFixed(digits)) : x);

/** The `--format json` document (numbers rounded to 0.001). */
export function curveJson(r: CurveResult) {
	return {
		model: modelVersion,
		plan: r.plan.name,
		attenuationConvention: 'one-way dB/cm/MHz^n coefficients; curve values are round trip',
		/** What lowDb–highDb holds and leaves out. */
		band: bandScopeNote,
		layers: r.plan.layers.map((l, i) => ({
			layer: i + 1,
			...(l.tissue.id ? {tissueId: l.tissue.id} : {}),
			label: l.tissue.label,
			thicknessCm: i === r.plan.layers.length - 1 ? null : l.thicknessCm,
			speedMps: l.tissue.speedMps,
			densityKgM3: l.tissue.densityKgM3,
			alphaDbPerCmMhz: l.tissue.alphaDbPerCmMhz,
			exponent: l.tissue.exponent,
			source: l.tissue.source ?? null,
		})),
		samples: r.samples.map((s) => ({
			displayedDepthCm: round(s.displayedDepthCm),
			trueDepthCm: round(s.trueDepthCm),
			/** 1-based layer, skin down, that this depth falls in. */
			layer: s.layerIndex + 1,
			attenuationDb: round(s.attenuationDb),
			interfaceLossDb: round(s.interfaceLossDb),
			compensationDb: round(s.compensationDb),
			lowDb: round(s.lowDb),
			highDb: round(s.highDb),
			echoCenterMhz: round(s.echoCenterMhz),
			blocked: s.blocked,
			belowNoise: s.belowNoise,
		})),
		sliders: r.fit.sliders.map((s) => ({
			depthCm: round(s.depthCm),
			gainDb: round(s.gainDb, 2),
			// With a measured scanner: the position as a fraction of full travel (−1…1, 0 = centred).
			...(r.plan.scanner?.sliderTravelDb ? {travelFraction: round(s.gainDb / r.plan.scanner.sliderTravelDb, 3)} : {}),
		})),
		...(r.plan.scanner
			? {scanner: {id: r.plan.scanner.id, label: r.plan.scanner.label, sliderTravelDb: r.plan.scanner.sliderTravelDb}}
			: {}),
		masterGainDb: round(r.fit.masterGainDb, 2),
		residualDb: round(r.fit.residualDb),
		penetrationDepthCm: r.penetrationDepthCm === null ? null : round(r.penetrationDepthCm),
		blockedDepthCm: r.blockedDepthCm === null ? null : round(r.blockedDepthCm),
		noiseBudgetDb: round(r.plan.noiseBudgetDb),
		warnings: r.warnings.map((w) => ({
			code: w.code,
			severity: w.severity,
			message: w.message,
			depthCm: w.depthCm === undefined ? null : round(w.depthCm),
		})),
		caution: cautionLine,
	};
}

const csvColumns = [
	'displayedDepthCm',
	'trueDepthCm',
	'layer',
	'attenuationDb',
	'interfaceLossDb',
	'compensationDb',
	'lowDb',
	'highDb',
	'echoCenterMhz',
	'blocked',
	'belowNoise',
] as const;

/**
 * The samples as RFC 4180 CSV: one header row, then one row per depth. RFC 4180 has no comments, so
 * the band's sentence (what lowDb–highDb holds and leaves out) is a last column, `bandNote`, filled
 * on the first data row and empty below it: every record keeps the same field count, and the columns
 * before it keep their names and places.
 */
export function curveCsv(r: CurveResult): string {
	const rows = curveJson(r).samples.map((s, i) => [
		...csvColumns.map((c) => String(s[c])),
		i === 0 ? bandScopeNote : '',
	]);
	return stringify([[...csvColumns, 'bandNote'], ...rows], {record_delimiter: '\r\n'});
}
