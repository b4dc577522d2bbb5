/** Fixed-width text helpers for the views (pure). */

/**
 * Deliberate short forms for the long words of tissue names, tried in order before anything is cut
 * (a sonographer reads "Sk. muscle, across" where "Skeletal mu" says nothing).
 */
const shortForms: readonly (readonly [RegExp, string])[] = [
	[/ \(across fibres\)/, ', across'],
	[/ \(along fibres\)/, ', along'],
	[/ \(subcutaneous\)/, ', subcut.'],
	[/ \(dermis\)/, ''],
	[/, steatotic \(fatty\)/, ', fatty'],
	[/Skeletal muscle/, 'Sk. muscle'],
	[/Tissue-mimicking phantom/, 'TM phantom'],
	[/stand-off pad/i, 'stand-off'],
	[/Generic soft tissue/, 'Soft tissue'],
	[/Simple cyst fluid/, 'Cyst fluid'],
	[/Amniotic fluid/, 'Amniotic'],
	[/ \(whole\)/, ''],
	[/ \(full bladder\)/, ''],
	[/ \(0\.7 grade\)/, ' 0.7'],
	// Starting-point names beside the curve pane (100 columns).
	[/^Paediatric /, 'Paed. '],
	// Row labels: a layer number past 9 makes the target's label one character too long.
	[/ below layer (\d+) top/, ' below L$1 top'],
];

/** The deliberate short form of `text` that fits `width`, or the shortest one there is. */
export function abbreviate(text: string, width: number): string {
	let out = text;
	for (const [pattern, short] of shortForms) {
		if (out.length <= width) return out;
		out = out.replace(pattern, short);
	}
	return out;
}

/**
 * Fits `width`: first the deliberate short forms, then a cut at a word boundary marked with `…`
 * (not `~`, which means the noise floor on the plot). A word is cut only when it alone is too long.
 */
export function clip(text: string, width: number): string {
	if (width <= 0) return '';
	if (text.length <= width) return text;
	const short = abbreviate(text, width);
	if (short.length <= width) return short;
	const room = Math.max(0, width - 1);
	const head = short.slice(0, room + 1);
	const cut = Math.max(head.lastIndexOf(' '), head.lastIndexOf(','), head.lastIndexOf('('));
	const kept = (cut > room / 2 ? short.slice(0, cut) : short.slice(0, room)).replace(/[\s,(]+$/, '');
	return `${kept}…`;
}

export function padTo(text: string, width: number): string {
	return clip(text, width).padEnd(width);
}
