// Plain, deterministic frames: no CI short-cuts in Ink, no colour codes.
delete process.env['CI'];
delete process.env['FORCE_COLOR'];
delete process.env['NO_COLOR'];
