/**
 * The protocol table as JSON, format `evenecho-table/1`: inputs, tissues with sources, model
 * version, caution line, simplifications and one object per row. Numbers are rounded like
 * `evenecho curve --format json` (gains 0.01 dB, depths and residual 0.001), so a row can be
 * compared with the curve of the same plan. {@link tableJsonSchema} describes and checks it.
 */
import {z} from 'zod';
import {modelVersion} from '../engine/compensation-curve.js';
import {cautionLine} from '../report/cautions.js';
import type {ProtocolTable, TableRow} from './sweep-runner.js';
import type {WarningCode} from '../engine/types.js';
import {roundTo} from '../plan/rounding.js';
import {
	depthDecimals,
	gainDecimals,
	mhzDecimals,
	residualDecimals,
	sweptLayerLabel,
	warningLegend,
	type TableFormatOptions,
	type TextParts,
} from './table-common.js';

export const tableFormat = 'evenecho-table/1';

const warningCodes = Object.keys(warningLegend) as [WarningCode, ...WarningCode[]];

const tissueJsonSchema = z.strictObject({
	where: z.string(),
	id: z.string().nullable(),
	label: z.string(),
	speedMps: z.number(),
	densityKgM3: z.number(),
	alphaDbPerCmMhz: z.number(),
	exponent: z.number(),
	source: z.string(),
	from: z.string().nullable(),
});

const rowJsonSchema = z.strictObject({
	row: z.number().int().min(1),
	layerCm: z.number().nullable(),
	centerMhz: z.number().positive(),
	angleDeg: z.number().min(0),
	receive: z.enum(['fundamental', 'tissue-harmonic', 'scatterer-harmonic']),
	swappedTissues: z.array(z.strictObject({layer: z.number().int().min(1), label: z.string()})),
	sliders: z.array(z.strictObject({depthCm: z.number(), gainDb: z.number()})),
	masterGainDb: z.number(),
	delta: z.strictObject({masterDeltaDb: z.number(), sliderDeltasDb: z.array(z.number())}).nullable(),
	residualDb: z.number().min(0),
	residualAtCm: z.number(),
	penetrationDepthCm: z.number().nullable(),
	blockedDepthCm: z.number().nullable(),
	usableDepthCm: z.number(),
	noiseBudgetDb: z.number(),
	targetDepthCm: z.number(),
	highestReachingMhz: z.number().nullable(),
	highestReachingPenetrationCm: z.number().nullable(),
	warnings: z.array(z.strictObject({code: z.enum(warningCodes), message: z.string(), depthCm: z.number().nullable()})),
});

/** The whole document. */
export const tableJsonSchema = z.strictObject({
	format: z.literal(tableFormat),
	model: z.string(),
	caution: z.string(),
	generatedAt: z.string().optional(),
	inputs: z.strictObject({
		source: z.string().nullable(),
		plan: z.string(),
		region: z.string(),
		sweptLayer: z
			.strictObject({layer: z.number().int().min(1), label: z.string(), planThicknessCm: z.number()})
			.nullable(),
		layerCm: z.array(z.number()),
		layerSwept: z.boolean(),
		centerMhz: z.array(z.number()),
		angleDeg: z.array(z.number()),
		receive: z.array(z.enum(['fundamental', 'tissue-harmonic', 'scatterer-harmonic'])),
		swaps: z.array(z.strictObject({layer: z.number().int().min(1), tissues: z.array(z.string())})),
		delta: z.boolean(),
		ladderMhz: z.array(z.number()),
		marginDb: z.number(),
		targetDepthCm: z.number(),
		targetRule: z.string(),
		displayDepthCm: z.number(),
		assumedSpeedMps: z.number(),
		bandwidthFraction: z.number(),
		stepCm: z.number(),
		sliders: z.strictObject({
			count: z.number().int(),
			minDb: z.number(),
			maxDb: z.number(),
			knots: z.enum(['band-centres', 'band-edges']),
			ends: z.enum(['flat', 'extrapolate']),
			rampDbPerCmMhz: z.number(),
			knotDepthsCm: z.array(z.number()),
		}),
		masterGain: z.strictObject({minDb: z.number(), maxDb: z.number()}),
	}),
	standardHabitus: z.strictObject({masterGainDb: z.number(), slidersDb: z.array(z.number())}),
	tissues: z.array(tissueJsonSchema),
	attenuationConvention: z.string(),
	notes: z.array(z.string()),
	columns: z.record(z.string(), z.string()),
	rows: z.array(rowJsonSchema),
});

export type TableJson = z.infer<typeof tableJsonSchema>;

const g = (x: number) => roundTo(x, gainDecimals);
const d = (x: number) => roundTo(x, depthDecimals);
const dn = (x: number | null) => (x === null ? null : d(x));

function rowJson(t: ProtocolTable, r: TableRow): TableJson['rows'][number] {
	return {
		row: r.index,
		layerCm: r.layerCm === null ? null : d(r.layerCm),
		centerMhz: roundTo(r.centerMhz, mhzDecimals),
		angleDeg: roundTo(r.angleDeg, 2),
		receive: r.receive,
		swappedTissues: t.sweep.swaps.map((s, k) => ({layer: s.layer, label: r.swapLabels[k]!})),
		sliders: r.slidersDb.map((x, k) => ({depthCm: d(t.knotDepthsCm[k]!), gainDb: g(x)})),
		masterGainDb: g(r.masterGainDb),
		delta: r.delta ? {masterDeltaDb: g(r.delta.masterDeltaDb), sliderDeltasDb: r.delta.sliderDeltasDb.map(g)} : null,
		residualDb: roundTo(r.residualDb, residualDecimals),
		residualAtCm: d(r.residualAtCm),
		penetrationDepthCm: dn(r.penetrationDepthCm),
		blockedDepthCm: dn(r.blockedDepthCm),
		usableDepthCm: d(r.usableDepthCm),
		noiseBudgetDb: d(r.noiseBudgetDb),
		targetDepthCm: d(r.targetDepthCm),
		highestReachingMhz: r.highestReachingMhz === null ? null : roundTo(r.highestReachingMhz, mhzDecimals),
		highestReachingPenetrationCm: dn(r.highestReachingPenetrationCm),
		warnings: r.warnings.map((w) => ({
			code: w.code,
			message: w.message,
			depthCm: w.depthCm === undefined ? null : d(w.depthCm),
		})),
	};
}

/** The document as a plain object (what `--format json` prints). */
export function tableJson(t: ProtocolTable, o: TableFormatOptions = {}): TableJson {
	return {...tableJsonHead(t, o), rows: t.rows.map((r) => rowJson(t, r))};
}

/** Everything but the rows, in the document's key order (`rows` comes last). */
function tableJsonHead(t: ProtocolTable, o: TableFormatOptions): Omit<TableJson, 'rows'> {
	const s = t.sweep;
	const doc = s.doc;
	return {
		format: tableFormat,
		model: modelVersion,
		caution: cautionLine,
		...(o.generatedAt ? {generatedAt: o.generatedAt} : {}),
		inputs: {
			source: o.source ?? null,
			plan: doc.name,
			region: doc.region,
			sweptLayer:
				s.layerIndex === null
					? null
					: {
							layer: s.layerIndex + 1,
							label: sweptLayerLabel(t)!,
							planThicknessCm: d(doc.layers[s.layerIndex]!.thicknessCm),
						},
			layerCm: s.fatCm.map(d),
			layerSwept: s.fatSwept,
			centerMhz: s.freqMhz.map((f) => roundTo(f, mhzDecimals)),
			angleDeg: s.angleDeg.map((a) => roundTo(a, 2)),
			receive: [...s.receive],
			swaps: s.swaps.map((w) => ({layer: w.layer, tissues: w.choices.map((c) => c.record.label)})),
			delta: s.delta,
			ladderMhz: s.ladderMhz.map((f) => roundTo(f, mhzDecimals)),
			marginDb: s.marginDb,
			targetDepthCm: d(s.targetDepthCm),
			targetRule: s.targetRule,
			displayDepthCm: d(doc.display.depthCm),
			assumedSpeedMps: doc.display.assumedSpeedMps,
			bandwidthFraction: doc.probe.bandwidthFraction,
			stepCm: s.stepCm,
			sliders: {...doc.sliders, knotDepthsCm: t.knotDepthsCm.map(d)},
			masterGain: {minDb: doc.masterGain.minDb, maxDb: doc.masterGain.maxDb},
		},
		standardHabitus: {masterGainDb: g(t.reference.masterGainDb), slidersDb: t.reference.slidersDb.map(g)},
		tissues: t.tissues.map((u) => ({
			where: u.where,
			id: u.tissue.id ?? null,
			label: u.tissue.label,
			speedMps: u.tissue.speedMps,
			densityKgM3: u.tissue.densityKgM3,
			alphaDbPerCmMhz: u.tissue.alphaDbPerCmMhz,
			exponent: u.tissue.exponent,
			source: u.tissue.source ?? 'no source recorded',
			from: u.from ?? null,
		})),
		attenuationConvention: 'one-way dB/cm/MHz^n coefficients; curve values are round trip',
		notes: [...t.notes],
		columns: {
			layerCm: 'thickness of the swept layer, cm',
			angleDeg: 'beam angle from the layer normal in the first layer, degrees',
			sliders: 'fitted slider values, dB, at their knot depths (displayed cm)',
			masterGainDb: 'fitted master gain, dB',
			delta: 'with --delta: row minus the standard habitus (the plan as it is), dB',
			residualDb: 'worst |fitted − curve| over the usable depth, dB',
			penetrationDepthCm: 'displayed depth where the echo meets the noise floor; null if not on screen',
			targetDepthCm: "this row's target depth, displayed cm (follows the layers above it when the plan says so)",
			highestReachingPenetrationCm:
				'where that frequency meets the noise floor, displayed cm; null if none reaches or beyond 40 cm',
			highestReachingMhz:
				'highest ladder frequency reaching the target depth within the noise budget less the margin; null if none',
		},
	};
}

/** `--format json` text: two-space indent, trailing newline. */
export function tableJsonText(t: ProtocolTable, o: TableFormatOptions = {}): string {
	return JSON.stringify(tableJson(t, o), null, 2) + '\n';
}

/** Rows per chunk of the chunked formats: big enough to write efficiently, small enough to hold. */
export const rowsPerChunk = 500;

/**
 * The same text as {@link tableJsonText} in parts, for rows written as they are computed. `t` may
 * be a table without its rows (see tableFrame in sweep-parallel.ts): only its row count is used.
 */
export function tableJsonParts(t: ProtocolTable, o: TableFormatOptions = {}, rowCount = t.sweep.rowCount): TextParts {
	const head = JSON.stringify({...tableJsonHead(t, o), rows: []}, null, 2);
	if (rowCount === 0) return {head: head + '\n', rows: () => '', end: () => ''};
	let first = true;
	return {
		head: head.slice(0, -'[]\n}'.length) + '[\n',
		rows(batch) {
			if (!batch.length) return '';
			const text = batch
				.map((r) => '    ' + JSON.stringify(rowJson(t, r), null, 2).replaceAll('\n', '\n    '))
				.join(',\n');
			const lead = first ? '' : ',\n';
			first = false;
			return lead + text;
		},
		end: () => '\n  ]\n}\n',
	};
}

/**
 * The same text as {@link tableJsonText} in pieces, a few hundred rows each, so a 20,000-row table
 * is written out without ever being one string.
 */
export function* tableJsonChunks(t: ProtocolTable, o: TableFormatOptions = {}): Generator<string> {
	const parts = tableJsonParts(t, o, t.rows.length);
	yield parts.head;
	for (let i = 0; i < t.rows.length; i += rowsPerChunk) yield parts.rows(t.rows.slice(i, i + rowsPerChunk));
	yield parts.end();
}
