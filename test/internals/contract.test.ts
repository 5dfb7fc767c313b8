import { readFile } from 'node:fs/promises';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { PROBLEMS } from '../../src/common/errors.js';
import { ENGINE_VERSION } from '../../src/engine/version.js';
import { generateOpenApi } from '../../src/http/openapi.js';

const root = resolve(import.meta.dirname, '..', '..');

describe('when the contract documents change', () => {
  it('should keep openapi/openapi.json equal to the document generated from the schemas (run npm run openapi)', async () => {
    const committed = await readFile(join(root, 'openapi', 'openapi.json'), 'utf8');
    expect(committed).toBe(await generateOpenApi());
  });

  it('should say in the OpenAPI description that this is not a medical device', async () => {
    const doc = JSON.parse(await generateOpenApi());
    expect(doc.openapi).toBe('3.1.0');
    expect(doc.info.description).toMatch(/not a medical device/i);
    expect(doc.info.description).toMatch(/local regulations and licensed practice/);
  });

  it('should document every problem code in docs/problems.md', async () => {
    const doc = await readFile(join(root, 'docs', 'problems.md'), 'utf8');
    for (const [code, entry] of Object.entries(PROBLEMS)) {
      expect(doc, code).toContain(`## ${code}\n\nStatus ${entry.status}`);
    }
  });

  it('should emit only registered problem codes from the sources', () => {
    const used = new Set<string>();
    const walk = (dir: string): void => {
      for (const name of readdirSync(dir)) {
        const path = join(dir, name);
        if (statSync(path).isDirectory()) walk(path);
        else if (path.endsWith('.ts')) for (const m of readFileSync(path, 'utf8').matchAll(/(?:ProblemError|DomainError|problemType)\(\s*'([a-z-]+)'/g)) used.add(m[1]!);
      }
    };
    walk(join(root, 'src'));
    expect(used.size).toBeGreaterThan(5);
    for (const code of used) expect(Object.keys(PROBLEMS), code).toContain(code);
  });

  it('should name the same engine version as package.json', async () => {
    const pkg = JSON.parse(await readFile(join(root, 'package.json'), 'utf8'));
    expect(ENGINE_VERSION).toBe(pkg.version);
  });
});
