export { AcceptInvitationRoute as default } from '../../features/invitations/routes/accept-invitation';
