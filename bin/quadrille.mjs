#!/usr/bin/env node
// Launcher for the Quadrille command line: registers the tsx TypeScript loader in this process
// (no build step, no second process) and runs src/cli/main.ts, found relative to this file.
import { register } from 'tsx/esm/api';

register();
await import(new URL('../src/cli/main.ts', import.meta.url).href);
