export { ResetPasswordRoute as default } from '../../features/auth/routes/reset-password';
