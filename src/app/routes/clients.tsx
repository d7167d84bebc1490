export { ClientsListRoute as default } from '../../features/clients/routes/clients-list';
