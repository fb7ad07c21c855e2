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
