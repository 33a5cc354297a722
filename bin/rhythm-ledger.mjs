#!/usr/bin/env node
// Runs the TypeScript command line through tsx, so the validation kit uses exactly the src/core
// code the tablet app and the unit server use, with no build step.
import { register } from 'tsx/esm/api';

register();
const { runCli, nodeCliIo } = await import('../src/cli/main.ts');
process.exitCode = await runCli(process.argv.slice(2), nodeCliIo());
