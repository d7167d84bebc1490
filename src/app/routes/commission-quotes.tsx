export { CommissionQuotesRoute as default } from '../../features/quotes/routes/commission-quotes';
