/**
 * The sliders drawn as the scanner's bank of them: one track per slider, skin at the top, with the
 * knob where this plan sets it and a mark at the centre detent. Our own drawing, in the plot's
 * characters: `o` a slider (`@` the chosen one), `|` the centre, `.` the rest of the track. In dB
 * offsets, or, when the plan names a measured scanner profile, in fractions of full travel. Pure.
 */
import type {CurveResult} from '../../engine/types.js';
import {glyph} from '../kit/depth-plot.js';

export interface SliderBank {
	/** What the track's ends mean, as wide as a track line. */
	readonly header: string;
	/** One line per slider: `[....|..o..]`. */
	readonly rows: readonly string[];
}

/** Knob column of `value` on a track of `width` cells from `low` to `high` (clamped). */
export function knobAt(value: number, low: number, high: number, width: number): number {
	const t = high > low ? (value - low) / (high - low) : 0.5;
	return Math.max(0, Math.min(width - 1, Math.round(t * (width - 1))));
}

export function sliderBank(curve: CurveResult, trackWidth: number, selected = -1): SliderBank {
	const w = Math.max(5, trackWidth);
	const travel = curve.plan.scanner?.sliderTravelDb ?? null;
	const [low, high] = travel ? [-1, 1] : [curve.plan.sliders.minDb, curve.plan.sliders.maxDb];
	const centre = knobAt(0, low, high, w);
	const rows = curve.fit.sliders.map((s, k) => {
		const cells = new Array<string>(w).fill('.');
		if (low <= 0 && high >= 0) cells[centre] = '|';
		cells[knobAt(travel ? s.gainDb / travel : s.gainDb, low, high, w)] = k === selected ? glyph.selected : glyph.slider;
		return `[${cells.join('')}]`;
	});
	const lowText = travel ? '-1' : String(low);
	const signed = (x: number) => (x > 0 ? `+${x}` : String(x));
	const long = travel ? '+1 travel' : `${signed(high)} dB`;
	const highText = lowText.length + long.length + 1 <= w + 2 ? long : travel ? '+1' : signed(high);
	const gap = Math.max(1, w + 2 - lowText.length - highText.length);
	return {header: `${lowText}${' '.repeat(gap)}${highText}`, rows};
}
