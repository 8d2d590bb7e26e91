#!/usr/bin/env node
// Launcher: registers tsx's loader and runs the TypeScript CLI from source in this same process,
// so a fresh clone works after `npm ci` and signals reach the CLI directly.
import { register } from 'tsx/esm/api';

register();
await import('../src/cli/main.ts');
