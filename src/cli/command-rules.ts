/**
 * Rules every command follows, applied to the whole command tree in one place:
 * - an option given twice is refused (it would otherwise silently keep the last value), except
 *   options that are lists by design (`table --swap`);
 * - an unknown sub-command is named as such, with the list of commands that exist.
 */
import type {Command} from 'commander';
import {printable} from '../files/printable.js';
import {UsageError} from '../errors/usage-error.js';

/** Options meant to be repeated (each occurrence adds to a list). */
const repeatable = new Set(['swap']);

function everyCommand(root: Command): Command[] {
	return [root, ...root.commands.flatMap((c) => everyCommand(c))];
}

/** Refuses a second occurrence of any option but the repeatable ones, naming it. */
export function refuseRepeatedOptions(root: Command): void {
	for (const command of everyCommand(root)) {
		for (const option of command.options) {
			const name = option.attributeName();
			if (repeatable.has(name)) continue;
			let seen = 0;
			// Commander announces every occurrence of an option with this event.
			command.on(`option:${option.name()}`, () => {
				seen += 1;
				if (seen > 1)
					throw new UsageError(`${option.long ?? option.flags}: given more than once; give each option once`);
			});
		}
	}
}

/** The message for a word that is not one of `command`'s sub-commands. */
export function unknownCommandError(command: Command, word: string): UsageError {
	const names = command.commands.map((c) => c.name()).filter((n) => n !== 'help');
	const path = command.parent ? `${command.name()} ` : '';
	return new UsageError(
		`unknown command "${path}${printable(word, 60)}"; the commands are: ` +
			`${names.map((n) => `${path}${n}`).join(', ')} (see evenecho ${path}--help)`,
	);
}

/**
 * For a command that only groups sub-commands (`presets`): an unknown word is refused with the
 * list, and the bare group shows its help.
 */
export function groupAction(command: Command): void {
	command.allowExcessArguments(true).action(() => {
		const [word] = command.args;
		if (word !== undefined) throw unknownCommandError(command, word);
		command.help({error: true});
	});
}
