/**
 * The readable summary of a scanner profile: what was measured, the grey map and depth response
 * sampled coarsely, slider travel, noise floor and penetration, and how sure each band is.
 */
import type {ScannerProfile} from '../calibration/profile-document.js';

const f1 = (x: number) => x.toFixed(1);
const signed = (x: number) => `${x >= 0 ? '+' : ''}${x.toFixed(1)}`;

export function scannerProfileText(p: ScannerProfile): string {
	const out: string[] = [];
	out.push(`scanner profile ${p.id}  "${p.name}"`);
	out.push(`  ${p.label}`);
	out.push(
		`  measured at ${p.probe.centerMhz} MHz (bandwidth ${p.probe.bandwidthFraction}), ` +
			`display ${p.displayDepthCm} cm, ${p.sliderCount} sliders; phantom ` +
			`${p.phantom.alphaDbPerCmMhz} dB/cm/MHz${p.phantom.exponent === 1 ? '' : `^${p.phantom.exponent}`}, ` +
			`${p.phantom.speedMps} m/s`,
	);
	if (p.savedAt) out.push(`  saved ${p.savedAt}`);
	out.push('');
	const g = p.greyMap;
	out.push(
		`grey map (level shown at each grey, dB on the master-gain scale), grey ${f1(g[0]!.grey)}–${f1(g[g.length - 1]!.grey)}:`,
	);
	const every = Math.max(1, Math.ceil(g.length / 8));
	out.push(
		`  ${g
			.filter((_, i) => i % every === 0 || i === g.length - 1)
			.map((q) => `${q.grey.toFixed(0)}→${f1(q.levelDb)}`)
			.join('  ')}`,
	);
	out.push('');
	out.push("depth response (the scanner's own depth gain with sliders centred, dB re the shallowest depth):");
	const rows = p.depthResponse.filter((_, i) => i % 2 === 0 || i === p.depthResponse.length - 1);
	for (let i = 0; i < rows.length; i += 6)
		out.push(
			`  ${rows
				.slice(i, i + 6)
				.map((d) => `${d.depthCm.toFixed(2).padStart(5)} cm ${signed(d.gainDb).padStart(5)}`)
				.join('  ')}`,
		);
	out.push('');
	const stepText = (s: ScannerProfile['sliderSteps'][number]) =>
		`slider ${s.slider} at ${s.position > 0 ? '+' : ''}${s.position}: ${f1(s.travelDb)} dB, ` +
		`influence ${f1(s.influenceWidthCm)} cm wide`;
	const steps = p.sliderSteps.length ? ` (${p.sliderSteps.map(stepText).join('; ')})` : '';
	out.push(
		p.sliderTravelDb === null
			? 'slider travel: not measured (no slider-step image)'
			: `slider travel: full travel adds ${f1(p.sliderTravelDb)} dB at a slider's knot${steps}`,
	);
	if (p.penetrationCm !== null) {
		out.push(
			`penetration: ${f1(p.penetrationCm)} cm (echo power = noise power, 0 dB echo-to-noise); ` +
				`noise budget ${f1(p.noiseBudgetDb ?? Number.NaN)} dB at ${p.probe.centerMhz} MHz`,
		);
	} else {
		out.push(
			p.noiseFloor
				? 'penetration: beyond the deepest measured depth'
				: 'penetration: not measured (no probe-in-air image)',
		);
	}
	if (p.pixelRatioPenetration) {
		const enr = p.pixelRatioPenetration.echoToNoiseDb;
		const there = enr === null ? '' : ` (echo-to-noise there ${signed(enr)} dB)`;
		out.push(`  ${p.pixelRatioPenetration.criterion}: ${f1(p.pixelRatioPenetration.depthCm)} cm${there}`);
	}
	const cells = p.bands.map((b) => b.cells);
	const sds = p.bands.map((b) => b.sdDb).filter(Number.isFinite);
	out.push(
		`bands: ${p.bands.length} of 0.5 cm, ${Math.min(...cells)}–${Math.max(...cells)} ` +
			`independent speckle cells each (speckle cell ${f1(p.cellAreaPx)} px²), level SD ` +
			`${Math.min(...sds).toFixed(2)}–${Math.max(...sds).toFixed(2)} dB; map fit residual ` +
			`${p.rmsResidualDb.toFixed(2)} dB rms`,
	);
	for (const n of p.notes) out.push(`note: ${n}`);
	if (p.caution) out.push('', p.caution);
	return `${out.join('\n')}\n`;
}
