#!/usr/bin/env node
// Command-line entry: `daybreak info ...`, `daybreak scan ...`. Runs the TypeScript sources through tsx.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../electron/host/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
