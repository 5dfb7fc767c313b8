/**
 * The registry of methods: the recipe union, the method names, and the module behind each name.
 * Adding a method is one module (src/methods/<name>.ts) and one entry in each list below.
 */
import { z } from 'zod';
import type { MethodModule } from './method.js';
// In the order of the recipe union, which is also the order of the OpenAPI document's schemas.
import { welch } from './welch.js';
import { multitaper } from './multitaper.js';
import { periodogram } from './periodogram.js';
import { spectrogram } from './spectrogram.js';
import { morlet } from './morlet.js';
import { connectivity } from './connectivity.js';

/** Every method, in the order the recipe union and the documentation list them. */
export const METHOD_MODULES = [welch, multitaper, periodogram, spectrogram, morlet, connectivity] as const;

export const RecipeSchema = z.discriminatedUnion('method', [welch.schema, multitaper.schema, periodogram.schema, spectrogram.schema, morlet.schema, connectivity.schema]).meta({ id: 'Recipe' });

export type RecipeInput = z.input<typeof RecipeSchema>;
export type Recipe = z.output<typeof RecipeSchema>;
export type MethodName = Recipe['method'];

export const METHODS = METHOD_MODULES.map((m) => m.name) as readonly MethodName[];

const byName = new Map<string, MethodModule<Recipe>>(METHOD_MODULES.map((m) => [m.name, m as unknown as MethodModule<Recipe>]));

/** The module of a recipe's method. */
export function methodOf<R extends Recipe>(recipe: R): MethodModule<R> {
  const module = byName.get(recipe.method);
  if (!module) throw new TypeError(`no method module for "${String(recipe.method)}"`);
  return module as unknown as MethodModule<R>;
}

/** Names of the methods whose result is a spectrum per channel (the spectrum path). */
export const SPECTRUM_METHODS = METHOD_MODULES.filter((m) => m.path === 'spectrum').map((m) => m.name);
