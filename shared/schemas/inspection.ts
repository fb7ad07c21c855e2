import { z } from 'zod';

export const measurementUploadSchema = z.object({
  instrumentId: z.coerce.number().int().positive().optional(),
});

export const lotIdParams = z.object({ id: z.coerce.number().int().positive() });
