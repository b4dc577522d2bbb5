/**
 * The one rule for what a text field from outside may hold (plan names, regions, notes, tissue
 * labels, preset names, bundle fields), applied at every door: plan files, `presets save`, imports
 * and stored records all go through the zod schemas that use it, so nothing is accepted that the
 * store would later refuse to list. Refused: control characters (tab and line feed only in
 * multi-line fields), invisible format characters such as bidi overrides, line/paragraph
 * separators, and unpaired surrogates.
 */
import {superRefine} from 'zod/mini';
import type {z} from 'zod';

const singleLine = /[\p{Cc}\p{Cf}\p{Zl}\p{Zp}\p{Cs}]/u;
const multiLine = /(?![\t\n])[\p{Cc}\p{Cf}\p{Zl}\p{Zp}\p{Cs}]/u;

export interface TextRuleOptions {
	/** Allow tab and line feed (a note); single-line fields allow neither. @default false */
	readonly multiline?: boolean;
}

/** The first character the rule refuses, described for a message, or undefined when the text is fine. */
export function findUnsafeCharacter(text: string, options: TextRuleOptions = {}): string | undefined {
	const match = (options.multiline ? multiLine : singleLine).exec(text);
	if (!match) return undefined;
	const code = match[0].codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0');
	const position = [...text.slice(0, match.index)].length + 1;
	return `U+${code} at character ${position}`;
}

/** The rule in words, for messages and help. */
export function textRuleText(options: TextRuleOptions = {}): string {
	return options.multiline
		? 'must not contain control or invisible formatting characters (tab and line breaks are fine)'
		: 'must be one line without control or invisible formatting characters';
}

/** Adds the rule to a string schema; the message names the first offending character. */
export function safeText<S extends z.core.$ZodType<string> & {check(...c: z.core.$ZodCheck<string>[]): S}>(
	schema: S,
	options: TextRuleOptions = {},
): S {
	// As a check, not classic zod's superRefine method: the plan schema is built with zod/mini.
	return schema.check(
		superRefine((value: string, ctx) => {
			const found = findUnsafeCharacter(value, options);
			if (found) ctx.addIssue({code: 'custom', message: `${textRuleText(options)} (found ${found})`});
		}),
	);
}
