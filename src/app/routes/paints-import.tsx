export { PaintsImportRoute as default } from '../../features/paints/routes/paint-edit';
