// The one way counts are written: "1 lot", "7 lots" (shared/format.ts, also used by PDFs and mails).
export { plural as counted } from '@shared/format';
