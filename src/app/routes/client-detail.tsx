export { ClientDetailRoute as default } from '../../features/clients/routes/client-detail';
