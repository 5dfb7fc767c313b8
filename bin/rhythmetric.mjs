#!/usr/bin/env node
// `rhythmetric <command>`: runs the compiled CLI when `npm run build` has made dist/, else the
// TypeScript sources through tsx.
import { existsSync } from 'node:fs';

const compiled = new URL('../dist/cli/main.js', import.meta.url);
if (existsSync(compiled)) {
  await import(compiled.href);
} else {
  const { register } = await import('tsx/esm/api');
  register();
  await import(new URL('../src/cli/main.ts', import.meta.url).href);
}
