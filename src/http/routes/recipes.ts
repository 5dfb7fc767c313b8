import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { AppDeps } from '../app.js';
import { IdParams, PinnedRecipeSchema, problemResponse } from '../schemas.js';
import { RecipeSchema } from '../../recipes/schema.js';
import { getRecipe, pinRecipe } from '../../jobs/plan.js';
import { warnDeprecated } from '../deprecations.js';
import { zodValidator } from '../validation.js';

export const recipeRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    app.post(
      '/v1/recipes',
      {
        schema: {
          summary: 'Pin a recipe',
          description:
            "Answers the recipe with every default filled in, its SHA-256 over canonical JSON (RFC 8785), and an id derived from that hash. A record's `recipe` may be sent as the record prints it: its `id` and `hash` must be those of its settings (422 naming the field otherwise); its `derived` values are checked against the signal when a job runs.",
          tags: ['recipes'],
          body: RecipeSchema,
          response: { 201: PinnedRecipeSchema, 400: problemResponse('malformed request'), 422: problemResponse('invalid recipe (pointer names the field)') },
        },
        config: { access: 'submit' },
        // The recipe is parsed by normalizeRecipe, which names misspelt settings and contradictions.
        validatorCompiler: zodValidator({ body: z.unknown() }),
      },
      async (request, reply) => {
        const { id, hash, recipe } = await pinRecipe(deps.store, request.body);
        warnDeprecated(reply, request.body, '');
        return reply.code(201).header('location', `/v1/recipes/${id}`).send({ id, hash, recipe });
      },
    );

    app.get(
      '/v1/recipes/:id',
      {
        schema: { summary: 'Fetch a pinned recipe', tags: ['recipes'], params: IdParams, response: { 200: PinnedRecipeSchema, 404: problemResponse('unknown recipe') } },
      },
      async (request) => getRecipe(deps.store, request.params.id),
    );
  };
