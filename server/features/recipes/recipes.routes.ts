import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { recipeInput, recipeListQuery, type RecipeListQuery } from '../../../shared/schemas/recipes';
import { arrayPage } from '../../lib/page';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { RecipesService } from './recipes.service';

const recipeParams = z.object({ studioId: id, recipeId: id });

/** Recipes name the rack's paints, so they are the studio's alone; clients see a scheme's swatches instead. */
export function recipesRoutes(r: RouteTable, deps: { allow: Allow; recipes: RecipesService }) {
  const { allow, recipes } = deps;
  const staff = () => allow('owner', 'painter');
  r.get('/studios/:studioId/recipes', staff(), validate({ query: recipeListQuery }), json(async (req, res) => arrayPage(res, await recipes.list(member(req).studioId, query<RecipeListQuery>(res)))));
  r.post('/studios/:studioId/recipes', staff(), validate({ body: recipeInput }), json((req) => recipes.create(member(req).studioId, user(req).id, req.body), 201));
  r.get('/studios/:studioId/recipes/:recipeId', staff(), validate({ params: recipeParams }), json((req, res) => recipes.get(member(req).studioId, params(res).recipeId)));
  r.put('/studios/:studioId/recipes/:recipeId', staff(), validate({ params: recipeParams, body: recipeInput }), json((req, res) => recipes.replace(member(req).studioId, params(res).recipeId, req.body)));
  r.delete('/studios/:studioId/recipes/:recipeId', staff(), validate({ params: recipeParams }), json((req, res) => recipes.remove(member(req).studioId, params(res).recipeId)));
}
