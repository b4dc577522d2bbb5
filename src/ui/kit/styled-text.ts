/**
 * A theme style applied to a string as escape codes, the way Ink's `<Text>` applies the same props
 * (chalk, in Ink's order: dim, colour, bold, underline, inverse), so the bytes are the ones Ink would
 * write. For a line made of many differently styled runs: one `<Text>` holding them costs Ink one
 * node instead of one per run (the plot's rows were a third of a key press's React work).
 */
import chalk, {type ForegroundColorName} from 'chalk';
import type {TextStyle} from './theme.js';

export function styledText(text: string, style: TextStyle): string {
	if (text === '') return text;
	let s = text;
	if (style.dimColor) s = chalk.dim(s);
	// The themes name only chalk's own colours (theme.ts).
	if (style.color) s = chalk[style.color as ForegroundColorName](s);
	if (style.bold) s = chalk.bold(s);
	if (style.underline) s = chalk.underline(s);
	if (style.inverse) s = chalk.inverse(s);
	return s;
}
