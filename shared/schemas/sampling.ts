// The plan look-up's query, as text (URL query, command-line options): numbers are read from their
// text, then checked as planFor checks them.
import { z } from 'zod';
import { samplingInputSchema } from '../sampling/plan';

const numberFromText = (value: unknown) => (typeof value === 'string' && value.trim() !== '' ? Number(value) : value);

export const planQuerySchema = z.object({
  lotSize: z.preprocess(numberFromText, samplingInputSchema.shape.lotSize),
  level: samplingInputSchema.shape.level,
  aql: z.preprocess(numberFromText, samplingInputSchema.shape.aql),
  severity: samplingInputSchema.shape.severity,
});
export type PlanQuery = z.infer<typeof planQuerySchema>;
