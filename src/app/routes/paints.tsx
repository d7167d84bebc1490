export { PaintsListRoute as default } from '../../features/paints/routes/paints-list';
