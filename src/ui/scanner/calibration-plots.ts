/**
 * The three results of a calibration as text plots, pure and colour-free:
 * - grey map: grey across, level (dB) down the rows, `*` per point;
 * - depth response: depth down the rows (skin at the top, as everywhere in the console), gain across, `*`;
 * - penetration: the same depth axis, echo-to-noise across, `|` at 0 dB, `v` marking the penetration row.
 */
import type {ScannerCalibration} from '../../calibration/scanner-calibration.js';

const label = (v: number, w = 6) => v.toFixed(1).padStart(w);

/** Grey map: rows from the highest level down, greys across. */
export function greyMapPlot(cal: ScannerCalibration, width: number, height: number): string[] {
	const pts = cal.greyMap;
	const lo = Math.min(...pts.map((p) => p.levelDb));
	const hi = Math.max(...pts.map((p) => p.levelDb));
	const gLo = pts[0]!.grey;
	const gHi = pts[pts.length - 1]!.grey;
	const plotW = Math.max(10, width - 8);
	const rows: string[][] = Array.from({length: height}, () => new Array<string>(plotW).fill(' '));
	for (let c = 0; c < plotW; c++) {
		const g = gLo + ((gHi - gLo) * c) / (plotW - 1);
		let k = 1;
		while (k < pts.length - 1 && pts[k]!.grey < g) k++;
		const a = pts[k - 1]!;
		const b = pts[k]!;
		const level = a.levelDb + ((g - a.grey) / Math.max(1e-9, b.grey - a.grey)) * (b.levelDb - a.levelDb);
		const r = Math.round(((hi - level) / Math.max(1e-9, hi - lo)) * (height - 1));
		rows[Math.min(height - 1, Math.max(0, r))]![c] = '*';
	}
	const out = rows.map((r, i) => `${i === 0 ? label(hi) : i === height - 1 ? label(lo) : '      '} |${r.join('')}`);
	out.push(`${' '.repeat(7)}+${'-'.repeat(plotW)}`);
	out.push(`${' '.repeat(8)}grey ${gLo.toFixed(0)}${' '.repeat(Math.max(1, plotW - 16))}${gHi.toFixed(0)}`);
	return out;
}

/** One value per depth row: linear between samples, blank outside them. */
function sampleAt(depths: readonly number[], values: readonly number[], d: number): number | null {
	if (!depths.length || d < depths[0]! - 0.25 || d > depths[depths.length - 1]! + 0.25) return null;
	let i = 1;
	while (i < depths.length - 1 && depths[i]! < d) i++;
	const t = Math.max(0, Math.min(1, (d - depths[i - 1]!) / Math.max(1e-9, depths[i]! - depths[i - 1]!)));
	return values.length === 1 ? values[0]! : values[i - 1]! + t * (values[i]! - values[i - 1]!);
}

function depthPlot(
	depthCm: number,
	height: number,
	width: number,
	value: (d: number) => number | null,
	lo: number,
	hi: number,
	mark?: (d: number, row: string[]) => void,
): string[] {
	const plotW = Math.max(10, width - 8);
	const out: string[] = [];
	for (let r = 0; r < height; r++) {
		const d = ((r + 0.5) * depthCm) / height;
		const row = new Array<string>(plotW).fill(' ');
		mark?.(d, row);
		const v = value(d);
		if (v !== null && Number.isFinite(v)) {
			const c = Math.round(((v - lo) / Math.max(1e-9, hi - lo)) * (plotW - 1));
			row[Math.min(plotW - 1, Math.max(0, c))] = '*';
		}
		out.push(`${d.toFixed(1).padStart(5)}cm|${row.join('')}`);
	}
	out.push(`${' '.repeat(7)}+${'-'.repeat(plotW)}`);
	out.push(`${' '.repeat(8)}${lo.toFixed(0)} dB${' '.repeat(Math.max(1, plotW - 12))}${hi.toFixed(0)} dB`);
	return out;
}

export function depthResponsePlot(cal: ScannerCalibration, width: number, height: number): string[] {
	const depths = cal.depthResponse.map((p) => p.depthCm);
	const gains = cal.depthResponse.map((p) => p.gainDb);
	const lo = Math.floor(Math.min(0, ...gains));
	const hi = Math.ceil(Math.max(...gains, lo + 1));
	return depthPlot(cal.displayDepthCm, height, width, (d) => sampleAt(depths, gains, d), lo, hi);
}

export function penetrationPlot(cal: ScannerCalibration, width: number, height: number): string[] {
	const withEnr = cal.bands.filter((b) => b.echoToNoiseDb !== null && Number.isFinite(b.echoToNoiseDb));
	if (!withEnr.length) return ['no probe-in-air image: noise floor and penetration not measured'];
	const depths = withEnr.map((b) => b.depthCm);
	const enr = withEnr.map((b) => b.echoToNoiseDb!);
	const lo = Math.min(-6, Math.floor(Math.min(...enr)));
	const hi = Math.max(6, Math.ceil(Math.max(...enr)));
	const plotW = Math.max(10, width - 8);
	const zero = Math.round(((0 - lo) / (hi - lo)) * (plotW - 1));
	const rowCm = cal.displayDepthCm / height;
	return depthPlot(
		cal.displayDepthCm,
		height,
		width,
		(d) => sampleAt(depths, enr, d),
		lo,
		hi,
		(d, row) => {
			row[zero] = '|';
			if (cal.penetrationCm !== null && Math.abs(d - cal.penetrationCm) <= rowCm / 2)
				row.fill('v', 0, Math.max(0, zero));
		},
	);
}
