export { ForgotPasswordRoute as default } from '../../features/auth/routes/forgot-password';
