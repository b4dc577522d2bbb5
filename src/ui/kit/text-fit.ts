/** Fixed-width text helpers for the views (pure). */

/** Cut to `width`, the cut marked with `…` (not `~`, which means the noise floor on the plot). */
export function clip(text: string, width: number): string {
	if (width <= 0) return '';
	return text.length <= width ? text : `${text.slice(0, Math.max(0, width - 1))}…`;
}

export function padTo(text: string, width: number): string {
	return clip(text, width).padEnd(width);
}
