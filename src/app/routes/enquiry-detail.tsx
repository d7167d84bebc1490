export { EnquiryDetailRoute as default } from '../../features/enquiries/routes/enquiry-detail';
