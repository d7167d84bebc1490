export { SignUpRoute as default } from '../../features/auth/routes/sign-up';
