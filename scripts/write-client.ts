/**
 * `npm run client`: regenerates the typed client's types (src/client/api-types.ts) from
 * openapi/openapi.json with openapi-typescript. Run it after `npm run openapi`; a test fails when the
 * committed types are stale. `--check` exits 1 instead of writing when they differ.
 */
import { readFile, writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import openapiTS, { astToString } from 'openapi-typescript';

const root = resolve(import.meta.dirname, '..');
export const CLIENT_TYPES = resolve(root, 'src', 'client', 'api-types.ts');
const DOCUMENT = resolve(root, 'openapi', 'openapi.json');

const HEADER = `/**
 * Generated from openapi/openapi.json by openapi-typescript (\`npm run client\`). Do not edit: a
 * test fails when this file is stale.
 */

`;

/** The text of src/client/api-types.ts for the committed OpenAPI document. */
export async function generateClientTypes(): Promise<string> {
  const document = await readFile(DOCUMENT, 'utf8');
  const nodes = await openapiTS(JSON.parse(document) as never, { silent: true, alphabetize: true });
  return HEADER + astToString(nodes);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const text = await generateClientTypes();
  if (process.argv.includes('--check')) {
    const committed = await readFile(CLIENT_TYPES, 'utf8').catch(() => '');
    if (committed !== text) {
      process.stderr.write(`${CLIENT_TYPES} is stale: run npm run client\n`);
      process.exit(1);
    }
    process.stdout.write('client types are up to date\n');
  } else {
    await writeFile(CLIENT_TYPES, text);
    process.stdout.write(`wrote ${CLIENT_TYPES}\n`);
  }
}
