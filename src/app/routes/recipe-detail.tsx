export { RecipeDetailRoute as default } from '../../features/recipes/routes/recipe-pages';
