import {mkdtempSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';

// Plain, deterministic frames: no CI short-cuts in Ink, no colour codes.
delete process.env['CI'];
delete process.env['FORCE_COLOR'];
delete process.env['NO_COLOR'];

// No test may touch the user's real preset store; tests that need a store make their own.
process.env['EVENECHO_HOME'] = mkdtempSync(join(tmpdir(), 'evenecho-test-home-'));
