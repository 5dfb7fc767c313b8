import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = resolve(import.meta.dirname, '..', '..');

function* sources(dir: string): Generator<string> {
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) {
      if (name !== 'fixtures' || dir.endsWith('test')) yield* sources(path);
    } else if (/\.(ts|py)$/.test(name)) yield path;
  }
}

describe('when code and tests cite their sources', () => {
  const references = readFileSync(join(root, 'docs', 'references.md'), 'utf8');
  const sections = new Set([...references.matchAll(/^## §(\d+) /gm)].map((m) => Number(m[1])));

  it('should cite only sections that docs/references.md has', () => {
    const missing: string[] = [];
    for (const dir of ['src', 'test', 'scripts', 'bench']) {
      for (const file of sources(join(root, dir))) {
        const text = readFileSync(file, 'utf8');
        for (const m of text.matchAll(/docs\/references\.md (?:sec\. |§)(\d+)/g)) {
          if (!sections.has(Number(m[1]))) missing.push(`${relative(root, file)}: §${m[1]}`);
        }
      }
    }
    expect(sections.size).toBeGreaterThanOrEqual(8);
    expect(missing).toEqual([]);
  });

  it('should cite no file outside the repository', () => {
    const outside: string[] = [];
    for (const dir of ['src', 'test', 'scripts', 'bench']) {
      for (const file of sources(join(root, dir))) {
        if (file.endsWith('references.test.ts')) continue;
        if (/REFERENCES\.md|shared\//.test(readFileSync(file, 'utf8'))) outside.push(relative(root, file));
      }
    }
    expect(outside).toEqual([]);
  });
});
