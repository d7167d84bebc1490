export { PaletteViewRoute as default } from '../../features/palette/routes/palette-view';
