export { PaintEditRoute as default } from '../../features/paints/routes/paint-edit';
