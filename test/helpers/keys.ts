/** Key sequences as a terminal sends them, for keystroke tests. */
export const keys = {
	up: '\u001B[A',
	down: '\u001B[B',
	right: '\u001B[C',
	left: '\u001B[D',
	shiftUp: '\u001B[1;2A',
	shiftDown: '\u001B[1;2B',
	pageUp: '\u001B[5~',
	pageDown: '\u001B[6~',
	enter: '\r',
	escape: '\u001B',
	tab: '\t',
	/** What the Backspace key sends on most terminals (Ink calls it `delete`). */
	backspace: '\u007F',
	ctrlC: '\u0003',
} as const;
