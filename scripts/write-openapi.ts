/** `npm run openapi`: regenerates openapi/openapi.json from the route schemas. */
import { writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { generateOpenApi } from '../src/http/openapi.js';

const target = resolve(import.meta.dirname, '..', 'openapi', 'openapi.json');
await writeFile(target, await generateOpenApi());
process.stdout.write(`wrote ${target}\n`);
