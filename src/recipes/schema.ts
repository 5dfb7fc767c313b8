/**
 * The recipe: a union of the method modules' settings (src/methods/), built by the registry.
 * This module gives the recipe's types and schemas their familiar names.
 */
import type { MorletRecipe } from '../methods/morlet.js';
import type { MultitaperRecipe } from '../methods/multitaper.js';
import type { PeriodogramRecipe } from '../methods/periodogram.js';
import { methodOf, type Recipe } from '../methods/registry.js';
import type { SpectrogramRecipe } from '../methods/spectrogram.js';
import type { WelchRecipe } from '../methods/welch.js';

export { BandSchema, EpochingSchema, FeaturesSchema, RatioSchema, RECIPE_SCHEMA, type Band, type Epoching, type Features } from '../methods/settings.js';
export { METHODS, RecipeSchema, SPECTRUM_METHODS, type Recipe, type RecipeInput } from '../methods/registry.js';
export { WelchRecipeSchema, type WelchRecipe } from '../methods/welch.js';
export { MultitaperRecipeSchema, type MultitaperRecipe } from '../methods/multitaper.js';
export { PeriodogramRecipeSchema, type PeriodogramRecipe } from '../methods/periodogram.js';
export { SpectrogramRecipeSchema, type SpectrogramRecipe } from '../methods/spectrogram.js';
export { MorletRecipeSchema, type MorletRecipe } from '../methods/morlet.js';
export { ConnectivityRecipeSchema, type ConnectivityRecipe } from '../methods/connectivity.js';

export type SpectrumRecipe = WelchRecipe | MultitaperRecipe | PeriodogramRecipe;
export type TimeFrequencyRecipe = SpectrogramRecipe | MorletRecipe;

export function isSpectrumRecipe(recipe: Recipe): recipe is SpectrumRecipe {
  return methodOf(recipe).path === 'spectrum';
}
