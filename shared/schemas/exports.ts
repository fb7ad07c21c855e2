import { z } from 'zod';

/** What an auditor exports: documents issued in a date range, optionally of one supplier or part. */
export const exportFilterSchema = z
  .object({
    from: z.iso.date('Enter the first day as YYYY-MM-DD'),
    to: z.iso.date('Enter the last day as YYYY-MM-DD'),
    supplierId: z.coerce.number().int().positive().optional(),
    partId: z.coerce.number().int().positive().optional(),
  })
  .refine((filter) => filter.from <= filter.to, { path: ['to'], message: 'The last day comes before the first day' });
export type ExportFilter = z.infer<typeof exportFilterSchema>;

/** The documents a choice of supplier, part and (optionally) days finds, before an export is started. */
export const exportSpanQuerySchema = z.object({
  from: z.iso.date('Enter the first day as YYYY-MM-DD').optional(),
  to: z.iso.date('Enter the last day as YYYY-MM-DD').optional(),
  supplierId: z.coerce.number().int().positive().optional(),
  partId: z.coerce.number().int().positive().optional(),
});
export type ExportSpanQuery = z.infer<typeof exportSpanQuerySchema>;
/** How many documents were issued for the choice, and the first and last day (YYYY-MM-DD, UTC) of their issue. */
export type ExportSpanView = { documents: number; first: string | null; last: string | null };

export const EXPORT_STATUSES = ['queued', 'running', 'done', 'failed'] as const;
export type ExportStatus = (typeof EXPORT_STATUSES)[number];

export type ExportJobView = {
  id: number;
  requestedBy: number;
  filter: ExportFilter;
  status: ExportStatus;
  done: number;
  total: number;
  error: string | null;
  size: number | null;
  sha256: string | null;
  createdAt: string;
  finishedAt: string | null;
};
