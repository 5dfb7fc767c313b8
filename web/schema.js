// Recipe settings, their defaults and their help come from the service's own OpenAPI document, so
// the page shows what the server will fill in and never keeps a second copy of the defaults.

import { requestJson } from './api.js';

/**
 * A JSON Schema fragment as the OpenAPI document holds it.
 * @typedef {{ type?: string, const?: unknown, enum?: unknown[], default?: unknown, description?: string, minimum?: number, maximum?: number,
 *   exclusiveMinimum?: number, exclusiveMaximum?: number, anyOf?: JsonSchema[], oneOf?: JsonSchema[], properties?: Record<string, JsonSchema>,
 *   $ref?: string, items?: JsonSchema | false, required?: string[] }} JsonSchema
 */

/**
 * One setting the form can offer as a single input.
 * @typedef {{ name: string, kind: 'choice' | 'number' | 'integer' | 'boolean', choices: string[], nullable: boolean,
 *   default: unknown, description: string, min: number | null, max: number | null }} Setting
 */

/** @type {Promise<Record<string, JsonSchema>> | null} */
let schemas = null;

/** @returns {Promise<Record<string, JsonSchema>>} */
function load() {
  schemas ??= requestJson('/openapi.json').then((doc) => /** @type {{ components: { schemas: Record<string, JsonSchema> } }} */ (doc).components.schemas);
  return schemas;
}

/**
 * The recipe schema of each method, by method name.
 * @returns {Promise<Map<string, JsonSchema>>}
 */
export async function recipeSchemas() {
  const all = await load();
  const union = all.Recipe?.oneOf ?? all.Recipe?.anyOf ?? [];
  /** @type {Map<string, JsonSchema>} */
  const out = new Map();
  for (const entry of union) {
    const schema = entry.$ref ? all[entry.$ref.split('/').pop() ?? ''] : entry;
    const method = schema?.properties?.method?.const;
    if (schema && typeof method === 'string') out.set(method, schema);
  }
  return out;
}

/**
 * The settings of a method's recipe that fit one input (a choice, a number, a flag); structured
 * settings (bands, features, epoching…) are left to the JSON field.
 * @param {JsonSchema} schema
 * @returns {Setting[]}
 */
export function simpleSettings(schema) {
  /** @type {Setting[]} */
  const out = [];
  for (const [name, property] of Object.entries(schema.properties ?? {})) {
    if (name === 'method' || name === 'schema') continue;
    const variants = property.anyOf ?? [property];
    const nullable = variants.some((v) => v.type === 'null');
    const main = variants.filter((v) => v.type !== 'null');
    if (main.length !== 1) continue;
    const only = /** @type {JsonSchema} */ (main[0]);
    const common = { name, nullable, default: property.default, description: property.description ?? only.description ?? '' };
    const min = only.minimum ?? only.exclusiveMinimum ?? null;
    const max = only.maximum ?? only.exclusiveMaximum ?? null;
    if (only.type === 'string' && Array.isArray(only.enum)) out.push({ ...common, kind: 'choice', choices: only.enum.map(String), min: null, max: null });
    else if (only.type === 'number' || only.type === 'integer') out.push({ ...common, kind: only.type, choices: [], min, max });
    else if (only.type === 'boolean') out.push({ ...common, kind: 'boolean', choices: [], min: null, max: null });
  }
  return out;
}

/**
 * The settings not offered as single inputs, with their defaults, for the JSON field's help.
 * @param {JsonSchema} schema
 * @returns {string[]}
 */
export function structuredSettings(schema) {
  const simple = new Set(simpleSettings(schema).map((s) => s.name));
  return Object.keys(schema.properties ?? {}).filter((name) => name !== 'method' && name !== 'schema' && !simple.has(name));
}
