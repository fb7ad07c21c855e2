// The switching state per supplier and part (ISO 2859-1, clause 9): the quality manager's signed
// resumption after discontinuation and severity override, and the views of the state and its history.
import { z } from 'zod';
import { listQuerySchema } from './paging';
import { SEVERITIES, type Severity, type SwitchingPhase, type SwitchingState } from '../sampling';

export const switchingParams = z.object({
  supplierId: z.coerce.number().int().positive(),
  partId: z.coerce.number().int().positive(),
});
export type SwitchingParams = z.infer<typeof switchingParams>;

export const SWITCHING_PHASES = [...SEVERITIES, 'stopped'] as const satisfies readonly SwitchingPhase[];

export const SWITCHING_PHASE_LABELS: Record<SwitchingPhase, string> = {
  normal: 'Normal inspection',
  tightened: 'Tightened inspection',
  reduced: 'Reduced inspection',
  stopped: 'Acceptance discontinued',
};

export const switchingListQuerySchema = listQuerySchema.extend({
  supplierId: z.preprocess((v) => (v === '' ? undefined : v), z.coerce.number().int().positive().optional()),
  partId: z.preprocess((v) => (v === '' ? undefined : v), z.coerce.number().int().positive().optional()),
  phase: z.preprocess((v) => (v === '' ? undefined : v), z.enum(SWITCHING_PHASES).optional()),
});
export type SwitchingListQuery = z.infer<typeof switchingListQuerySchema>;

/** What each signature means, shown before signing and kept in the audit trail. */
export const RESUME_MEANING =
  'I resume acceptance inspection of this part from this supplier on tightened inspection: the supplier has acted to improve the quality of what it submits.';
export const OVERRIDE_MEANING =
  'I put this part from this supplier on the severity chosen, for the reason given, in place of what the switching rules reached.';

const signature = {
  password: z.string().min(1, 'Re-enter your password to sign'),
  meaningAcknowledged: z.literal(true, { error: 'Confirm the meaning of your signature' }),
};

export const resumeInspectionSchema = z
  .object({
    ...signature,
    correctiveAction: z.string().trim().min(10, 'Describe the supplier’s corrective action (10 characters or more)').max(2000),
    // An accepted corrective-action request of this supplier and part; without one, the reference of
    // an action recorded elsewhere (records from before the requests were kept here).
    correctiveActionId: z.number().int().positive().max(2_147_483_647).optional(),
    reference: z.string().trim().max(80).optional(),
  })
  .superRefine((value, ctx) => {
    if (!value.correctiveActionId && !value.reference)
      ctx.addIssue({ code: 'custom', path: ['reference'], message: 'Choose the accepted corrective-action request, or give the reference of the action' });
  });
export type ResumeInspectionInput = z.infer<typeof resumeInspectionSchema>;

export const severityOverrideSchema = z.object({
  ...signature,
  severity: z.enum(SEVERITIES, { error: `Choose one of ${SEVERITIES.join(', ')}` }),
  reason: z.string().trim().min(10, 'State the reason (10 characters or more)').max(2000),
});
export type SeverityOverrideInput = z.infer<typeof severityOverrideSchema>;

export type SwitchingRow = {
  supplierId: number;
  supplierName: string;
  partId: number;
  partNumber: string;
  partDescription: string;
  phase: SwitchingPhase;
  switchingScore: number;
  consecutiveAccepted: number;
  tightenedCount: number;
  waitingLots: number;
  changedAt: string | null;
};

export type SwitchingHistoryEntry = {
  id: number;
  kind: 'lot' | 'resume' | 'override';
  position: number;
  lotId: number | null;
  decision: string | null;
  /** For a lot: accepted or not, the defectives and the severity its plan was drawn on. */
  accepted: boolean | null;
  defectives: number | null;
  sampledOn: Severity | null;
  severity: Severity | null;
  reason: string | null;
  reference: string | null;
  /** The accepted corrective-action request a resumption rests on. */
  correctiveActionId: number | null;
  by: string | null;
  from: SwitchingPhase;
  to: SwitchingPhase;
  explanation: string;
  at: string;
  superseded: boolean;
};

export type SwitchingView = {
  supplier: { id: number; name: string };
  part: { id: number; number: string; description: string };
  phase: SwitchingPhase;
  state: SwitchingState;
  reducedEnabled: boolean;
  /** Lots received while acceptance was discontinued: in quarantine without a plan. */
  waitingLots: { id: number; supplierLot: string; quantity: number; receivedAt: string }[];
  /** Lots with a plan and no decision yet, with the severity each was sampled on. */
  openLots: { id: number; supplierLot: string; state: string; severity: Severity }[];
  history: SwitchingHistoryEntry[];
};
