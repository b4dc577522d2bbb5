/**
 * A bundler plugin for both bundles (rolldown.config.ts, rolldown.curve-script.config.ts).
 * commander requires child_process at its top for sub-commands that are programs of their own,
 * which evenecho has none of; loading it pulls in net, dgram and the stream modules, about a
 * twentieth of a `--version` start. commander gets a stand-in that loads the real module only if a
 * spawn is ever asked for (test/cli/commander-child-process.test.ts checks spawn is all it uses).
 */
import type {Plugin} from 'rolldown';

const standIn = '\0child-process-on-spawn';

export const commanderWithoutChildProcess: Plugin = {
	name: 'commander-without-child-process',
	resolveId(source, importer) {
		if (!/^(node:)?child_process$/.test(source) || !/[/\\]node_modules[/\\]commander[/\\]/.test(importer ?? ''))
			return null;
		return standIn;
	},
	load(id) {
		if (id !== standIn) return null;
		return 'module.exports = {spawn: (...args) => require("node:child_process").spawn(...args)};';
	},
};
