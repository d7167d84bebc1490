export { ClientNewRoute as default } from '../../features/clients/routes/client-new';
