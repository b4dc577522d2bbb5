/**
 * The readable summary of a curve: plan, layers, slider table, master gain, penetration, warnings
 * and cautions. Plain text, fits 80 columns.
 */
import {deliveredCompensationDb} from '../engine/compensation-curve.js';
import {impedanceMrayl} from '../engine/tissue-library.js';
import {bandScopeNote} from '../engine/uncertainty-band.js';
import type {CurveResult} from '../engine/types.js';
import {cautions} from './cautions.js';

const f1 = (x: number) => x.toFixed(1);
const pad = (s: string, n: number) => s.padEnd(n);
const lpad = (s: string, n: number) => s.padStart(n);

/** Signed dB with one decimal: "+3.2", "−1.0" kept ASCII for pasting. */
export function signedDb(x: number): string {
	const v = Math.abs(x) < 0.05 ? 0 : x;
	return `${v >= 0 ? '+' : '-'}${Math.abs(v).toFixed(1)}`;
}

export function curveSummary(r: CurveResult): string {
	const p = r.plan;
	const out: string[] = [];
	const bw =
		p.probe.bandwidthFraction > 0 ? `${Math.round(p.probe.bandwidthFraction * 100)} % bandwidth` : 'narrowband';
	out.push(`evenecho  ${p.name}  [${p.region}]`);
	const receive =
		(p.probe.receive ?? 'fundamental') !== 'fundamental'
			? ` (${p.probe.receive} receive at ${2 * p.probe.centerMhz} MHz)`
			: '';
	const steepness = (p.probe.spectrumSteepness ?? 2) !== 2 ? `, spectrum steepness ${p.probe.spectrumSteepness}` : '';
	out.push(
		`probe ${p.probe.centerMhz} MHz${receive}, ${bw}${steepness}, scatterer f^${p.scattererExponent}; ` +
			`display ${p.display.depthCm} cm at ${p.display.assumedSpeedMps} m/s`,
	);
	out.push('');
	out.push('Layers, skin down        true cm  c m/s  rho    Z MRayl  a0 dB/cm/MHz^n  n');
	p.layers.forEach((l, i) => {
		const t = l.tissue;
		const last = i === p.layers.length - 1;
		out.push(
			`  ${pad(`${i + 1} ${t.label}`.slice(0, 22), 22)} ` +
				`${lpad(last ? 'rest' : f1(l.thicknessCm), 6)}  ${lpad(String(t.speedMps), 5)}  ` +
				`${lpad(String(t.densityKgM3), 5)}  ${lpad(impedanceMrayl(t).toFixed(3), 7)}  ` +
				`${lpad(String(t.alphaDbPerCmMhz), 14)}  ${t.exponent}`,
		);
	});
	out.push('');
	const bank = p.sliders;
	out.push(
		`Depth-gain starting point (${bank.count} sliders ${bank.minDb}..${bank.maxDb} dB at ${bank.knots}, ${bank.ends} ends)`,
	);
	const travel = p.scanner?.sliderTravelDb ?? null;
	out.push(
		p.scanner
			? `  sliders are offsets from the scanner's own depth gain, measured on "${p.scanner.label}" ` +
					`(${p.scanner.id})${travel ? `; full travel = ${f1(travel)} dB` : ''}`
			: bank.rampDbPerCmMhz > 0
				? `  sliders are offsets from the scanner's own ramp, taken as ${bank.rampDbPerCmMhz} dB/cm/MHz (0 = centre detent)`
				: '  sliders are absolute (no built-in ramp assumed)',
	);
	out.push(`  slider  depth cm  slider dB  compensates dB${travel ? '  of travel' : ''}`);
	r.fit.sliders.forEach((s, i) => {
		const delivered = deliveredCompensationDb(p, r.fit, s.depthCm);
		const fraction = travel ? `  ${lpad(travelFractionText(s.gainDb / travel), 9)}` : '';
		out.push(
			`  ${lpad(String(i + 1), 6)}  ${lpad(f1(s.depthCm), 8)}  ${lpad(signedDb(s.gainDb), 9)}  ${lpad(f1(delivered), 13)}${fraction}`,
		);
	});
	out.push(
		`  master gain ${f1(r.fit.masterGainDb)} dB (skin level ${f1(p.masterGain.baseDb)} dB); ` +
			`fit within ${r.fit.residualDb.toFixed(2)} dB down to ${f1(r.usableDepthCm)} cm (worst ` +
			`at ${f1(r.fit.residualAtCm)} cm)`,
	);
	out.push(
		r.penetrationDepthCm === null
			? `  above the noise floor (${f1(p.noiseBudgetDb)} dB budget) over the whole ${p.display.depthCm} cm display`
			: `  reaches ${f1(r.penetrationDepthCm)} cm (displayed) before the noise floor (${f1(p.noiseBudgetDb)} dB budget)`,
	);
	if (r.blockedDepthCm !== null) out.push(`  no useful echoes beyond ${f1(r.blockedDepthCm)} cm (barrier)`);
	out.push('');
	out.push('Curve  shown cm  true cm  gain dB  band dB       echo MHz');
	const every = Math.max(1, Math.round(r.samples.length / 9));
	r.samples.forEach((s, i) => {
		if (i % every !== 0 && i !== r.samples.length - 1) return;
		const flag = s.blocked ? ' blocked' : s.belowNoise ? ' noise' : '';
		out.push(
			`       ${lpad(f1(s.displayedDepthCm), 8)}  ${lpad(f1(s.trueDepthCm), 7)}  ` +
				`${lpad(f1(s.compensationDb), 7)}  ${lpad(`${f1(s.lowDb)}-${f1(s.highDb)}`, 11)}  ` +
				`${lpad(s.echoCenterMhz.toFixed(2), 8)}${flag}`,
		);
	});
	out.push(`  ${bandScopeNote}`);
	const warnings = r.warnings.filter((w) => w.severity === 'warning');
	const notes = r.warnings.filter((w) => w.severity === 'note');
	if (warnings.length) {
		out.push('');
		out.push('Warnings');
		for (const w of warnings) out.push(`  ! ${w.message}`);
	}
	if (notes.length) {
		out.push('');
		out.push('Notes');
		for (const w of notes) out.push(`  - ${w.message}`);
	}
	out.push('');
	out.push('Tissue values from');
	p.layers.forEach((l, i) => out.push(`  ${i + 1} ${l.tissue.label}: ${l.tissue.source ?? 'no source given'}`));
	out.push('');
	out.push('Cautions');
	for (const c of cautions) out.push(`  - ${c}`);
	return out.join('\n') + '\n';
}

/** A slider position as a signed fraction of its full travel ("+0.35"; 0 = centred). */
export function travelFractionText(fraction: number): string {
	const v = Math.round(fraction * 100) / 100;
	return `${v > 0 ? '+' : v < 0 ? '−' : ''}${Math.abs(v).toFixed(2)}`;
}
