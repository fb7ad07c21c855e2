// What this feature reads of the instrument register (GET /api/instruments). The inspection
// endpoints' answers are typed once for both ends in shared/schemas/inspection.ts.
export type InstrumentOption = { id: number; code: string; kind: string; active: boolean; calibrationCurrent: boolean; calibrationDueOn: string };
