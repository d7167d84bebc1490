export { SignInRoute as default } from '../../features/auth/routes/sign-in';
