export { RecipeNewRoute as default } from '../../features/recipes/routes/recipe-pages';
