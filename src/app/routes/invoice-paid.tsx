export { InvoicePaidRoute as default } from '../../features/invoices/routes/invoice-paid';
