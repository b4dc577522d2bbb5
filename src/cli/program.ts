/** The `evenecho` program: options, sub-commands and the console as the default action. */
import {Command} from 'commander';
import {commandList, commandNamed} from './command-list.js';
import {groupAction, refuseRepeatedOptions, unknownCommandError} from './command-rules.js';

/**
 * The program for a command line: the sub-command it runs fully defined (loaded now), every other
 * one as a light entry for the help and for commander's "did you mean". `full` loads them all.
 */
export async function buildProgram(args: readonly string[] = [], full = false): Promise<Command> {
	const program = new Command('evenecho')
		.description(
			"Plan ultrasound depth-gain (TGC) starting points from a patient's layers, the probe and the scanner's sliders.",
		)
		.version('0.1.0')
		.exitOverride()
		.showHelpAfterError('(run evenecho --help for the commands)');
	const running = commandNamed(args);
	const terms = new Map<string, string>();
	for (const entry of commandList) {
		if (full || entry === running) (await entry.register())(program);
		else {
			program.command(entry.name).description(entry.description);
			terms.set(entry.name, entry.term);
		}
	}
	const help = program.createHelp();
	program.configureHelp({subcommandTerm: (cmd) => terms.get(cmd.name()) ?? help.subcommandTerm(cmd)});
	program.allowExcessArguments(true).action(async () => {
		const [word] = program.args;
		if (word !== undefined) throw unknownCommandError(program, word);
		const {openConsole} = await import('../ui/open-console.js');
		await openConsole();
	});
	for (const group of program.commands.filter((c) => c.commands.length > 0)) groupAction(group);
	refuseRepeatedOptions(program);
	return program;
}
