/**
 * Semantic colour tokens for the console. Views spread these props and never name a colour, so
 * NO_COLOR (or a monochrome terminal) gets the plain variant with nothing styled. Every meaning
 * carried by a colour is also carried by a character or a word (`>`, `!`, `~`, `#`), so the
 * plain variant loses nothing.
 */

/** Style props understood by Ink's `<Text>`. */
export interface TextStyle {
	readonly color?: string;
	readonly bold?: boolean;
	readonly dimColor?: boolean;
	readonly inverse?: boolean;
	readonly underline?: boolean;
}

export interface Theme {
	readonly name: 'colour' | 'plain';
	/** The current step in the step bar, the focused pane's title. */
	readonly current: TextStyle;
	/** The row under the cursor. */
	readonly selected: TextStyle;
	/** Labels and hints that matter less. */
	readonly muted: TextStyle;
	/** Field values. */
	readonly value: TextStyle;
	/** Refusals and errors beside a field. */
	readonly refusal: TextStyle;
	/** Curve warnings (noise floor, blocked depth, range exceeded). */
	readonly warning: TextStyle;
	/** Positive confirmations (saved, exported). */
	readonly done: TextStyle;
	/** The caution line, always shown. */
	readonly caution: TextStyle;
	/** Plot glyphs: the needed gain, the spread band, slider points. */
	readonly plotCurve: TextStyle;
	readonly plotBand: TextStyle;
	readonly plotSlider: TextStyle;
	readonly plotNoise: TextStyle;
	readonly plotBlocked: TextStyle;
	/** Borders of panes and overlays (Ink `borderColor`). */
	readonly border?: string;
	readonly focusBorder?: string;
}

export const colourTheme: Theme = {
	name: 'colour',
	current: {color: 'cyan', bold: true},
	selected: {color: 'cyan'},
	muted: {dimColor: true},
	value: {bold: true},
	refusal: {color: 'red', bold: true},
	warning: {color: 'yellow'},
	done: {color: 'green'},
	caution: {color: 'magenta'},
	plotCurve: {color: 'cyan', bold: true},
	plotBand: {color: 'blue'},
	plotSlider: {color: 'green', bold: true},
	plotNoise: {color: 'yellow', dimColor: true},
	plotBlocked: {color: 'red'},
	border: 'gray',
	focusBorder: 'cyan',
};

/** Nothing styled at all: no colour, no bold, no inverse (all of those are escape codes). */
export const plainTheme: Theme = {
	name: 'plain',
	current: {},
	selected: {},
	muted: {},
	value: {},
	refusal: {},
	warning: {},
	done: {},
	caution: {},
	plotCurve: {},
	plotBand: {},
	plotSlider: {},
	plotNoise: {},
	plotBlocked: {},
};

/** NO_COLOR set to anything non-empty (no-color.org) picks the plain theme. */
export function themeFromEnv(env: NodeJS.ProcessEnv = process.env): Theme {
	const noColor = env['NO_COLOR'];
	return noColor !== undefined && noColor !== '' ? plainTheme : colourTheme;
}
