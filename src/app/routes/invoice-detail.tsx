export { InvoiceDetailRoute as default } from '../../features/invoices/routes/invoice-detail';
