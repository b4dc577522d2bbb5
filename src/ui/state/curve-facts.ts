/**
 * Short words for what the curve says, shared by the curve pane, the curve step and the one-line
 * live summary. Each warning line starts with the plot's own character (`~` noise, `#` blocked,
 * `!` other, `i` a background note), so the meaning survives without colour.
 */
import {settingsDelta, settingsOf, type SettingsDelta} from '../../engine/plan-difference.js';
import type {CurveResult, CurveWarning} from '../../engine/types.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {signedDb} from '../../report/curve-summary.js';
import {glyph} from '../kit/depth-plot.js';

const f1 = (x: number) => x.toFixed(1);

export function shortWarning(w: CurveWarning, r: CurveResult): string {
	const at = w.depthCm === undefined ? '' : f1(w.depthCm);
	switch (w.code) {
		case 'strong-reflector':
			return `${glyph.blocked} strong reflector at ${at} cm: no useful echo below`;
		case 'strong-absorber':
			return `${glyph.blocked} strong absorber at ${at} cm: no useful echo below`;
		case 'below-noise-floor':
			return `${glyph.noise} below the noise floor from ${at} cm`;
		case 'slider-range-exceeded':
			return `! controls miss the curve by ${f1(r.fit.residualDb)} dB at ${at} cm`;
		case 'speed-mismatch': {
			const m = /^(.*?) \((\d+(?:\.\d+)?) m\/s\) is drawn ([\d.]+ % (?:thicker|thinner))/.exec(w.message);
			return m ? `i ${m[1]} drawn ${m[3]} (${m[2]} m/s)` : `i ${w.message}`;
		}
		case 'harmonic-simplified':
			return r.plan.probe.receive === 'scatterer-harmonic'
				? 'i scatterer harmonic: out at f0, back at 2 f0'
				: 'i tissue harmonic: built up from the skin, fitted from 1 cm';
		case 'thick-body-wall':
			return 'i thick body wall: reach changes; gain cannot fix wall clutter';
		case 'refraction-shift':
			return `i oblique beam: targets drawn sideways (refraction)`;
		case 'budget-receive-mismatch':
			return `! noise budget is for ${r.plan.noiseBudgetReceive ?? 'fundamental'}, not this receive mode`;
		case 'scanner-profile':
			return `i depth gain measured: ${r.plan.scanner?.label ?? 'scanner profile'}`;
	}
}

/** "reach: full 16 cm" / "reach: 12.3 cm, then noise". */
export function reachText(r: CurveResult): string {
	const noise =
		r.penetrationDepthCm === null
			? `full ${r.plan.display.depthCm} cm`
			: `${f1(r.penetrationDepthCm)} cm, ${glyph.noise} noise below`;
	const blocked = r.blockedDepthCm === null ? '' : `; ${glyph.blocked} blocked from ${f1(r.blockedDepthCm)} cm`;
	return `reach ${noise}${blocked}`;
}

export function masterLine(r: CurveResult, delta: SettingsDelta | null): string {
	const d = delta ? ` (${signedDb(delta.masterDeltaDb)} vs usual)` : '';
	return `master ${f1(r.fit.masterGainDb)} dB${d}`;
}

/** How closely sliders and master follow the curve over the usable depth. */
export function fitLine(r: CurveResult): string {
	return `fit within ${f1(r.fit.residualDb)} dB to ${f1(r.usableDepthCm)} cm`;
}

export function masterText(r: CurveResult, delta: SettingsDelta | null): string {
	return `${masterLine(r, delta)}  ${fitLine(r)}`;
}

/** This patient's settings minus the usual ones, when the plan has usual gains for this slider count. */
export function deltaOf(r: CurveResult, doc: PlanDocument): SettingsDelta | null {
	const ref = doc.reference;
	if (!ref || ref.slidersDb.length !== r.fit.sliders.length) return null;
	return settingsDelta(settingsOf(r.fit), ref);
}

/**
 * The one-line live summary under a step when the curve is not on screen, fitted to `width`.
 * Reach (with the noise floor and any barrier) and the warning count matter most, so the parts
 * that go first when the line is too narrow are the Tab hint, then the fit, then the "vs usual".
 */
export function liveLine(r: CurveResult, delta: SettingsDelta | null, width = Number.POSITIVE_INFINITY): string {
	const n = r.warnings.filter((w) => w.severity === 'warning').length;
	const warn = n ? `${n} warning${n > 1 ? 's' : ''} (w)` : '';
	const master = masterLine(r, delta);
	const bare = `master ${f1(r.fit.masterGainDb)} dB`;
	const fit = `fit ${f1(r.fit.residualDb)} dB`;
	const join = (parts: readonly string[]) => `Live: ${parts.filter(Boolean).join('  ')}`;
	const candidates = [
		join([master, fitLine(r), reachText(r), warn, '(Tab: curve)']),
		join([master, fitLine(r), reachText(r), warn]),
		join([master, fit, reachText(r), warn]),
		join([master, reachText(r), warn]),
		join([bare, reachText(r), warn]),
		join([reachText(r), warn]),
	];
	return candidates.find((c) => c.length <= width) ?? candidates[candidates.length - 1]!;
}
