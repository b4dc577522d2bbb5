/**
 * The sub-command word of a command line (`help X` counts as X), or undefined when there is none.
 * On its own so the installed command's first file can route a command line without loading the
 * command list.
 */
export function commandWord(args: readonly string[]): string | undefined {
	const words = args.filter((a) => !a.startsWith('-'));
	return words[0] === 'help' ? words[1] : words[0];
}
