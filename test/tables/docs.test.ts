import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { tableColumnsMarkdown } from '../../src/tables/docs.js';
import { TABLE_LEVELS } from '../../src/tables/columns.js';

const root = new URL('../../', import.meta.url);

describe('when the table columns are documented', () => {
  it('should list every column of every level in the README, as the code defines them', () => {
    const readme = readFileSync(new URL('README.md', root), 'utf8');
    expect(readme).toContain(tableColumnsMarkdown());
  });

  it('should give the same list in the OpenAPI description of the table route, with every level', () => {
    const openapi = JSON.parse(readFileSync(new URL('openapi/openapi.json', root), 'utf8')) as {
      paths: Record<string, { get: { description: string; parameters: { name: string; schema: { enum?: string[] } }[] } }>;
    };
    const route = openapi.paths['/v1/jobs/{id}/table']!.get;
    expect(route.description).toContain(tableColumnsMarkdown());
    expect(route.parameters.find((p) => p.name === 'level')!.schema.enum).toEqual([...TABLE_LEVELS]);
  });
});
