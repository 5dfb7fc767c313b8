/** Regenerates docs/problems.md from the problem registry (src/common/errors.ts). */
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { PROBLEMS } from '../src/common/errors.js';

let out = `# Problem types

Every error the API answers is RFC 9457 \`application/problem+json\`:

\`\`\`json
{ "type": "/problems/recipe-unfit", "title": "The recipe does not fit the signal", "status": 422,
  "detail": "a segment of 8 s (2000 samples) is longer than the epoch (1000 samples = 4 s)",
  "pointer": "/recipe/segmentSeconds", "requestId": "…" }
\`\`\`

\`type\` is stable and resolves on the service itself (\`GET /problems/<code>\`); \`pointer\` is an RFC 6901 JSON pointer into the request body (\`/query/…\` for query parameters); \`requestId\` matches the \`x-request-id\` response header and the logs.

`;
for (const [code, entry] of Object.entries(PROBLEMS)) out += `## ${code}\n\nStatus ${entry.status} — ${entry.title}. ${entry.about}\n\n`;
writeFileSync(resolve(import.meta.dirname, '..', 'docs', 'problems.md'), out);
