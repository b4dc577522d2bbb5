import {mkdtempSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import fc from 'fast-check';

// Plain, deterministic frames: no CI short-cuts in Ink, no colour codes.
delete process.env['CI'];
delete process.env['FORCE_COLOR'];
delete process.env['NO_COLOR'];

// No test may touch the user's real preset store; tests that need a store make their own.
process.env['EVENECHO_HOME'] = mkdtempSync(join(tmpdir(), 'evenecho-test-home-'));

// Property tests draw from one fixed seed so a CI run is reproducible: a red run must be a real
// failure that anyone can replay. EVENECHO_FC_SEED=<n> replays another seed; =random explores.
const seedSetting = process.env['EVENECHO_FC_SEED'];
if (seedSetting !== 'random') fc.configureGlobal({seed: seedSetting === undefined ? 20261202 : Number(seedSetting)});
