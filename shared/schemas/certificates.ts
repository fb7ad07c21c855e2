import { z } from 'zod';
import { listQuerySchema } from './paging';

export const verifyQuerySchema = z.object({
  number: z.string().trim().min(1, 'Enter the certificate number').max(40),
  hash: z
    .string()
    .trim()
    .toLowerCase()
    .regex(/^[0-9a-f]{64}$/, 'The hash is the 64-character SHA-256 printed on the document'),
});

export const certificateListSchema = listQuerySchema.extend({
  kind: z.enum(['certificate', 'inspection-report']).optional(),
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
  supplierId: z.coerce.number().int().positive().optional(),
  partId: z.coerce.number().int().positive().optional(),
});
export type CertificateListQuery = z.infer<typeof certificateListSchema>;

/** The public answer: only what is printed on the document itself. */
export type VerificationResult =
  | { genuine: false; message: string }
  | {
      genuine: true;
      current: boolean;
      message: string;
      document: {
        number: string;
        kind: 'certificate' | 'inspection-report';
        issuedAt: string;
        revokedAt: string | null;
        part: string;
        supplier: string;
        supplierLot: string;
        decision: string;
      };
    };
