export { PaintNewRoute as default } from '../../features/paints/routes/paint-edit';
