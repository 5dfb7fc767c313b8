import type { z } from 'zod';
import { CanonicalJsonError } from '../common/canonical-json.js';
import { deepFreeze } from '../common/freeze.js';
import { hashCanonical } from '../common/hash.js';
import { pointerOf, RecipeInputError } from './errors.js';
import { checkRecipeEcho, splitRecipeEcho } from './round-trip.js';
import { isSpectrumRecipe, METHODS, RecipeSchema, type Recipe, type SpectrumRecipe } from './schema.js';

export interface PinnedRecipe {
  id: string;
  hash: string;
  recipe: Recipe;
  /** derived values echoed by a record's recipe, checked once the signal is known (never stored) */
  derivedEcho?: unknown;
}

export function recipeIdFromHash(hash: string): string {
  return `rcp_${hash.slice(0, 32)}`;
}

/**
 * Parses a recipe, fills every default, rejects contradictions by name and returns it frozen with
 * its hash (SHA-256 of the canonical JSON). Two recipes that differ only in defaults they spell out
 * get the same hash. A record's `recipe` is accepted as it prints it: its `id` and `hash` must be
 * those of its settings, and its `derived` values are returned for a check against the signal.
 */
export function normalizeRecipe(input: unknown): PinnedRecipe {
  const { settings, echo } = splitRecipeEcho(input);
  const pinned = normalizeSettings(settings);
  if (!echo) return pinned;
  checkRecipeEcho(echo, pinned);
  return echo.derived === undefined ? pinned : { ...pinned, derivedEcho: echo.derived };
}

function normalizeSettings(input: unknown): PinnedRecipe {
  const parsed = RecipeSchema.safeParse(input);
  if (!parsed.success) throw fromZod(parsed.error);
  const recipe = parsed.data;
  if ('window' in recipe && recipe.tukeyRatio !== undefined && recipe.window !== 'tukey') {
    throw new RecipeInputError('invalid', `tukeyRatio applies only to window "tukey", not "${recipe.window}"`, '/tukeyRatio');
  }
  if ('window' in recipe && recipe.window === 'tukey' && recipe.tukeyRatio === undefined) recipe.tukeyRatio = 0.5;
  if (isSpectrumRecipe(recipe)) {
    checkCrossFields(recipe);
    recipe.ratios = recipe.ratios.map((r) => ({ ...r, name: r.name ?? `${r.numerator}/${r.denominator}` }));
  } else {
    checkTimeFrequency(recipe);
  }
  let hash: string;
  try {
    hash = hashCanonical(recipe);
  } catch (error) {
    if (error instanceof CanonicalJsonError) throw new RecipeInputError('invalid', error.message, error.pointer || '/');
    throw error;
  }
  return { id: recipeIdFromHash(hash), hash, recipe: deepFreeze(recipe) };
}

export function fromZod(error: z.ZodError): RecipeInputError {
  const issue = error.issues[0]!;
  const pointer = pointerOf(issue.path);
  let message = issue.message;
  if (issue.code === 'unrecognized_keys') {
    message = `unknown setting${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}; a misspelt setting is never replaced by a default`;
  } else if (issue.code === 'invalid_union' && issue.path.length === 0) {
    message = `method must be one of ${METHODS.map((m) => `"${m}"`).join(', ')}`;
  }
  return new RecipeInputError('invalid', message, pointer || '/');
}

function checkTimeFrequency(recipe: Exclude<Recipe, SpectrumRecipe>): void {
  if (recipe.frequencyRange && recipe.frequencyRange[0] >= recipe.frequencyRange[1]) {
    throw new RecipeInputError('invalid', 'frequencyRange must be [low, high] with low < high', '/frequencyRange/1');
  }
  if (recipe.method === 'connectivity') {
    const names = new Set<string>();
    recipe.bands.forEach((band, i) => {
      if (names.has(band.name)) throw new RecipeInputError('invalid', `band name "${band.name}" is used twice`, `/bands/${i}/name`);
      names.add(band.name);
    });
    recipe.pairs?.forEach(([a, b], i) => {
      if (a === b) throw new RecipeInputError('invalid', `pair ${i} joins channel "${a}" to itself`, `/pairs/${i}/1`);
    });
    return;
  }
  if (recipe.method === 'morlet') {
    const f = recipe.frequencies;
    if (!Array.isArray(f) && f.low >= f.high && f.count > 1) throw new RecipeInputError('invalid', 'frequencies.low must be below frequencies.high', '/frequencies/high');
    if (typeof recipe.cycles === 'object' && recipe.cycles.low > recipe.cycles.high) throw new RecipeInputError('invalid', 'cycles.low must not exceed cycles.high', '/cycles/high');
  }
  if (recipe.baseline && recipe.baseline.start >= recipe.baseline.end) throw new RecipeInputError('invalid', 'baseline.start must be before baseline.end', '/baseline/end');
  recipe.summary.forEach((w, i) => {
    if (w.low >= w.high) throw new RecipeInputError('invalid', `summary "${w.name}": low must be below high`, `/summary/${i}/high`);
    if (w.start >= w.end) throw new RecipeInputError('invalid', `summary "${w.name}": start must be before end`, `/summary/${i}/end`);
  });
  if (recipe.output === 'summary' && recipe.summary.length === 0) {
    throw new RecipeInputError('invalid', 'output "summary" needs at least one summary window', '/summary');
  }
}

function checkCrossFields(recipe: SpectrumRecipe): void {
  const ranges: [string, readonly [number, number] | null | undefined][] = [
    ['/frequencyRange', recipe.frequencyRange],
    ['/features/peakFrequency/range', recipe.features.peakFrequency?.range],
    ['/features/centroid/range', recipe.features.centroid?.range],
    ['/features/spectralEdge/range', recipe.features.spectralEdge?.range],
    ['/features/entropy/range', recipe.features.entropy?.range],
    ['/features/powerLaw/range', recipe.features.powerLaw?.range],
  ];
  for (const [pointer, range] of ranges) {
    if (range && range[0] >= range[1]) throw new RecipeInputError('invalid', `${pointer.slice(1)} must be [low, high] with low < high`, `${pointer}/1`);
  }
  if (recipe.features.powerLaw && recipe.features.powerLaw.range[0] <= 0) {
    throw new RecipeInputError('invalid', 'the power-law fit works on log10 f: its range must start above 0 Hz', '/features/powerLaw/range/0');
  }
  if (recipe.method === 'multitaper' && recipe.taperCount !== null && recipe.taperCount > 2 * recipe.timeBandwidth) {
    throw new RecipeInputError(
      'invalid',
      `taperCount ${recipe.taperCount} exceeds 2·timeBandwidth = ${2 * recipe.timeBandwidth}: tapers past 2NW are poorly concentrated; use at most ⌊2NW⌋ (⌊2NW⌋ − 1 is the usual choice)`,
      '/taperCount',
    );
  }
  const names = new Map<string, number>();
  recipe.bands.forEach((band, i) => {
    if (names.has(band.name)) throw new RecipeInputError('invalid', `band name "${band.name}" is used twice`, `/bands/${i}/name`);
    names.set(band.name, i);
  });
  recipe.ratios.forEach((ratio, i) => {
    for (const side of ['numerator', 'denominator'] as const) {
      if (!names.has(ratio[side])) {
        throw new RecipeInputError('invalid', `ratio ${side} "${ratio[side]}" is not a band of this recipe`, `/ratios/${i}/${side}`);
      }
    }
  });
}
