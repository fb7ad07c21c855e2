// The audit trail in words: what each record type and action is called on the trail's page and in
// its filters, and each recorded change as a list of fields that changed (before → after).
import { DISPOSITIONS, DISPOSITION_LABELS } from './inspection/lotVerdict';
import { NCR_DECISIONS, NCR_DECISION_LABELS } from './schemas/nonconformance';
import { MOVE_REASONS, MOVE_REASON_LABELS } from './schemas/stock';
import { formatDateTime, wordsOf } from './format';

export const RECORD_TYPE_LABELS: Record<string, string> = {
  audit: 'Audit trail',
  'corrective-action': 'Corrective-action request',
  'defect-code': 'Defect code',
  deviation: 'Deviation',
  export: 'Export',
  instrument: 'Instrument',
  lot: 'Lot',
  nonconformance: 'NCR',
  part: 'Part',
  'purchase-order': 'Purchase order',
  session: 'Sign-in',
  'sign-in-throttle': 'Sign-in throttle',
  'site-settings': 'Site settings',
  stock: 'Stock move',
  supplier: 'Supplier',
  switching: 'Switching',
  user: 'User',
  'vendor-return': 'Return to vendor',
};

const lower = (label: string) => label.charAt(0).toLowerCase() + label.slice(1);

/** Every action the server records, in words; decisions and stock moves from their own labels. */
export const ACTION_LABELS: Record<string, string> = {
  'audit.export': 'Audit trail exported',
  'auth.sign-in': 'Signed in',
  'auth.sign-in-refused': 'Sign-in refused',
  'auth.sign-in-throttled': 'Sign-in held back after failures',
  'auth.sign-out': 'Signed out',
  'auth.password-change': 'Password changed',
  'auth.password-change-refused': 'Password change refused',
  'auth.password-reset': 'Password reset',
  'auth.password-reset-link-sent': 'Password reset link sent',
  'corrective-action.raise': 'Corrective action requested',
  'corrective-action.accept': 'Corrective action accepted',
  'corrective-action.return': 'Corrective action returned to the supplier',
  'corrective-action.close': 'Corrective action closed',
  'corrective-action.link-new': 'Supplier link issued',
  'corrective-action.link-revoke': 'Supplier link revoked',
  'corrective-action.remind': 'Supplier reminded',
  'corrective-action.response': 'Supplier answered',
  'corrective-action.response-refused': 'Supplier answer refused',
  'defect-code.created': 'Defect code added',
  'defect-code.updated': 'Defect code changed',
  'deviation.create': 'Deviation requested',
  'deviation.update': 'Deviation changed',
  'deviation.approve': 'Deviation approved',
  'deviation.withdraw': 'Deviation withdrawn',
  ...Object.fromEntries(DISPOSITIONS.map((d) => [`disposition.${d}`, `Lot decision signed: ${lower(DISPOSITION_LABELS[d])}`])),
  'disposition.sort-completed': 'Sort completed',
  'export.create': 'Export requested',
  'export.download': 'Export downloaded',
  'instrument.create': 'Instrument added',
  'instrument.update': 'Instrument changed',
  'instrument.calibration.record': 'Calibration recorded',
  'instrument.calibration.certificate': 'Calibration certificate attached',
  'instrument.calibration.remind': 'Calibration reminder sent',
  'lot.receive': 'Lot received',
  'lot.plan-drawn': 'Sampling plan drawn',
  'measurement.upload': 'Bench file saved',
  'ncr.opened': 'NCR opened',
  'ncr.updated': 'NCR changed',
  'ncr.closed': 'NCR closed',
  'ncr.rework-released': 'Reworked pieces released',
  ...Object.fromEntries(NCR_DECISIONS.map((d) => [`ncr.disposition.${d}`, `NCR disposition signed: ${lower(NCR_DECISION_LABELS[d])}`])),
  'part.create': 'Part added',
  'part.update': 'Part changed',
  'purchase-order.create': 'Purchase order placed',
  'purchase-order.update': 'Purchase order changed',
  'return.shipped': 'Return shipped',
  'settings.update': 'Site settings changed',
  'signature.refused': 'Signature refused',
  'signature.locked': 'Signing locked',
  'signature.unlocked': 'Signing unlocked',
  ...Object.fromEntries(MOVE_REASONS.map((r) => [`stock.${r}`, `Stock move: ${lower(MOVE_REASON_LABELS[r])}`])),
  'supplier.create': 'Supplier added',
  'supplier.update': 'Supplier changed',
  'supplier.drift-alarm': 'Drift alarm raised',
  'switching.change': 'Inspection severity switched',
  'switching.override': 'Inspection severity set by hand',
  'switching.resume': 'Inspection resumed',
  'user.create': 'User added',
  'user.update': 'User changed',
};

/** Groups of actions a filter may choose as a whole (the action filter matches from the start). */
export const ACTION_GROUP_LABELS: Record<string, string> = {
  'auth.': 'Any sign-in or password event',
  'corrective-action.': 'Any corrective-action event',
  'deviation.': 'Any deviation event',
  'disposition.': 'Any lot decision',
  'instrument.': 'Any instrument or calibration event',
  'ncr.': 'Any NCR event',
  'signature.': 'Any signature event',
  'stock.': 'Any stock move',
  'switching.': 'Any switching event',
};

export const recordTypeWords = (type: string) => RECORD_TYPE_LABELS[type] ?? wordsOf(type);
export const actionWords = (action: string) => ACTION_LABELS[action] ?? wordsOf(action);

/** Field names whose words are not simply their parts. */
const FIELD_LABELS: Record<string, string> = {
  id: 'ID',
  aql: 'AQL',
  poNumber: 'PO number',
  retardanceTolWaves: 'Retardance tolerance (λ)',
  axisTolDeg: 'Fast-axis tolerance (°)',
  targetRetardanceWaves: 'Target retardance (λ)',
  wavelengthNm: 'Wavelength (nm)',
  uncertaintyWaves: 'Uncertainty (λ)',
  uncertaintyDeg: 'Uncertainty (°)',
  ncrId: 'NCR',
  carId: 'Corrective-action request',
  lotId: 'Lot',
  url: 'URL',
  sha256: 'SHA-256',
};

/** A field's words: "supplierLot" → "Supplier lot", "partId" → "Part", "aql" → "AQL". */
export function fieldWords(key: string): string {
  if (FIELD_LABELS[key]) return FIELD_LABELS[key];
  if (/^\d+$/.test(key)) return `no. ${Number(key) + 1}`;
  return wordsOf(key.replace(/(.)Ids?$/, '$1'));
}

const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/** A recorded value as text: instants as dates and times, yes/no, lists joined, nothing as a dash. */
export function valueWords(value: unknown): string {
  if (value === null || value === undefined || value === '') return '—';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') return ISO_INSTANT.test(value) ? formatDateTime(value) : value;
  if (typeof value === 'number') return String(value);
  if (Array.isArray(value)) return value.length === 0 ? 'none' : value.map(valueWords).join(', ');
  return JSON.stringify(value);
}

export type FieldChange = { path: string; label: string; before: string; after: string };

const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === 'object' && value !== null && !Array.isArray(value);
const isListOfRecords = (value: unknown): value is unknown[] => Array.isArray(value) && value.some(isRecord);

/** Every leaf of a recorded value by its path; lists of records by position, other lists whole. */
function leaves(value: unknown, path: string[], into: Map<string, { labels: string[]; value: unknown }>) {
  if (isRecord(value) || isListOfRecords(value)) {
    for (const [key, inner] of Object.entries(value)) leaves(inner, [...path, key], into);
    return;
  }
  into.set(path.join('.'), { labels: path.map(fieldWords), value });
}

/**
 * The fields that differ between the record before and after an action, in the order they first
 * appear: each with its words ("Lines › no. 1 › Quantity") and both values as text. A record
 * created has no before; one removed no after.
 */
export function changedFields(before: unknown, after: unknown): FieldChange[] {
  const was = new Map<string, { labels: string[]; value: unknown }>();
  const now = new Map<string, { labels: string[]; value: unknown }>();
  if (before !== null && before !== undefined) leaves(before, [], was);
  if (after !== null && after !== undefined) leaves(after, [], now);
  const paths = [...new Set([...was.keys(), ...now.keys()])];
  const changes: FieldChange[] = [];
  for (const path of paths) {
    const a = was.get(path);
    const b = now.get(path);
    const beforeText = valueWords(a?.value);
    const afterText = valueWords(b?.value);
    if (beforeText === afterText && JSON.stringify(a?.value) === JSON.stringify(b?.value)) continue;
    const labels = (b ?? a)!.labels;
    changes.push({ path, label: labels.length ? labels.join(' › ') : 'Value', before: beforeText, after: afterText });
  }
  return changes;
}
