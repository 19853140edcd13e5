#!/usr/bin/env node
// Launcher for the Quadrille command line: runs src/cli/main.ts (found relative to this file)
// through tsx, with no build step. tsx's require hook is used rather than its ESM loader: it
// transpiles in this thread, where Node 20's ESM hooks run on a separate loader thread, which
// costs about 0.3 s of CPU and 20 MB of memory at every start (this matters to the benchmark).
// So src/cli and src/dsp must not use top-level await or import.meta.
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);
require('tsx/cjs/api').register();
// tsx turns on source-mapped stack traces, which makes Node parse every module's inline map at
// load time; the CLI prints one-line errors, so keep them off unless debugging.
if (!process.env.QUADRILLE_DEBUG) process.setSourceMapsEnabled(false);
require('../src/cli/main.ts');
