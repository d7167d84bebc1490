export { RecipesListRoute as default } from '../../features/recipes/routes/recipes-list';
