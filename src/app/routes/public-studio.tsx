export { PublicStudioRoute as default } from '../../features/public-studio/routes/public-studio-page';
