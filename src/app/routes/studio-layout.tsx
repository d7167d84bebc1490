export { StudioLayout as default } from '../layouts/studio-layout';
