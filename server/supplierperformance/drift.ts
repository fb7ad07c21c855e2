// Drift alarms: after bench files are committed, each supplier-part whose results changed has the
// EWMA of its lot means recomputed (the year up to now); when the newest lot takes it past a limit
// and no alarm has been raised in that excursion yet, an alarm is recorded on that lot and mailed to
// the supplier's buyer and to quality, in one transaction, usually while the lots still pass. The
// job is queued by each bench-file commit and scheduled every few minutes besides; each run reads
// the piece results written since the last (a mark kept in the database), so a run repeated after a
// crash re-checks the same parts and raises nothing twice (one alarm per lot, and the supplier-part
// locked while it is checked).
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import {
  CHARACTERISTIC_LABELS,
  DRIFT_CHARACTERISTICS,
  resolvePeriod,
  type CharacteristicView,
  type DriftCharacteristic,
} from '../../shared/schemas/supplierPerformance';
import { lotName } from '../../shared/schemas/stock';
import { recordAudit, SYSTEM_ACTOR } from '../audit/record';
import { config } from '../config';
import { QUEUES, type JobDefinition } from '../jobs/queue';
import { queueMail } from '../mail/outbox';
import { measuredPieces } from './capability';
import { characteristicView, currentDrift } from './series';
import { formatDate, plural, signedFixed } from '../../shared/format';

export const supplierPerformanceUrl = (supplierId: number, partId: number) => `${config.PUBLIC_URL}/supplier-performance/${supplierId}?partId=${partId}`;

/** The supplier's buyer (every active buyer when the supplier has none) and every active quality manager. */
async function recipients(supplierId: number, transaction: Transaction) {
  const rows = await sequelize.query<{ email: string }>(
    `SELECT DISTINCT u.email FROM users u
      WHERE u.active AND ('quality' = ANY(u.roles)
         OR u.id = (SELECT owner_id FROM suppliers WHERE id = :supplierId)
         OR ('buyer' = ANY(u.roles) AND NOT EXISTS (SELECT 1 FROM suppliers s JOIN users o ON o.id = s.owner_id AND o.active WHERE s.id = :supplierId)))
      ORDER BY u.email`,
    { type: QueryTypes.SELECT, transaction, replacements: { supplierId } },
  );
  return rows.map((r) => r.email);
}

const DIGITS: Record<DriftCharacteristic, number> = { retardance: 4, axis: 3 };

function alarmText(
  supplierId: number,
  partId: number,
  names: { supplier: string; part: string },
  characteristic: DriftCharacteristic,
  view: CharacteristicView,
  drift: NonNullable<ReturnType<typeof currentDrift>>,
) {
  const { name, unit } = CHARACTERISTIC_LABELS[characteristic];
  const digits = DIGITS[characteristic];
  const value = (x: number) => `${signedFixed(x, digits)} ${unit}`;
  const lots = view.lots.slice(-6);
  return [
    `The mean ${name.toLowerCase()} of ${names.part} from ${names.supplier} is drifting ${drift.direction === 'high' ? 'up' : 'down'}: the EWMA of the lot means reached ${value(drift.lot.ewma!)} with lot ${drift.lot.lot.name} (supplier lot ${drift.lot.lot.supplierLot}), past its limit of ${value(drift.limit)}.`,
    `The ordered tolerance is ±${view.tolerance} ${unit}; ${drift.lot.failing === 0 ? 'no piece of that lot fails yet' : `${plural(drift.lot.failing, 'piece')} of that lot already fail`}.`,
    '',
    'Latest lot means:',
    ...lots.map(
      (p) =>
        `  ${p.lot.name} (${formatDate(p.receivedAt)}, ${p.pieces} measured${p.failing ? `, ${p.failing} failing` : ''}): ${value(p.mean)}, EWMA ${value(p.ewma!)}`,
    ),
    '',
    `EWMA of the lot means around the ordered value, weight ${view.ewma!.lambda}, limits at ${view.ewma!.width} standard deviations; σ of a lot mean ${view.ewma!.sigma.toFixed(digits + 1)} ${unit} from the moving ranges.`,
    characteristic === 'axis'
      ? 'A steady walk of the mean axis error often means a marking jig that has moved: ask the supplier to check it.'
      : 'Ask the supplier to check the thickness control of its recent lots.',
    '',
    `The charts: ${supplierPerformanceUrl(supplierId, partId)}`,
  ].join('\n');
}

/** Checks one supplier-part and raises the alarms it calls for; answers the alarms raised. */
export async function checkDrift(supplierId: number, partId: number, today = new Date()) {
  return inTransaction(async (transaction) => {
    // One check of a supplier-part at a time, so two runs never both raise an excursion's alarm.
    await sequelize.query('SELECT pg_advisory_xact_lock(:supplierId, :partId)', { transaction, replacements: { supplierId, partId } });
    const { pieces } = await measuredPieces(supplierId, partId, resolvePeriod({}, today), transaction);
    const [names] = await sequelize.query<{ supplier: string; part: string }>(
      'SELECT s.name AS supplier, p.number AS part FROM suppliers s, parts p WHERE s.id = :supplierId AND p.id = :partId',
      {
        type: QueryTypes.SELECT,
        transaction,
        replacements: { supplierId, partId },
      },
    );
    const raised: { id: number; characteristic: DriftCharacteristic; lotId: number }[] = [];
    for (const characteristic of DRIFT_CHARACTERISTICS) {
      const view = characteristicView(characteristic, pieces);
      const drift = currentDrift(view);
      if (!drift) continue;
      const [{ alarmed }] = await sequelize.query<{ alarmed: boolean }>(
        `SELECT EXISTS (SELECT 1 FROM drift_alarms WHERE supplier_id = :supplierId AND part_id = :partId AND characteristic = :characteristic AND lot_id IN (:lots)) AS alarmed`,
        { type: QueryTypes.SELECT, transaction, replacements: { supplierId, partId, characteristic, lots: drift.excursion } },
      );
      if (alarmed) continue;
      const { name } = CHARACTERISTIC_LABELS[characteristic];
      const mail = await queueMail(
        {
          to: await recipients(supplierId, transaction),
          subject: `Drift alarm: ${name.toLowerCase()} of ${names.part} from ${names.supplier} (lot ${drift.lot.lot.name})`,
          text: alarmText(supplierId, partId, names, characteristic, view, drift),
          related: { type: 'lot', id: drift.lot.lot.id },
        },
        transaction,
      );
      const [alarm] = await sequelize.query<{ id: number }>(
        `INSERT INTO drift_alarms (supplier_id, part_id, characteristic, lot_id, direction, lot_mean, ewma, limit_value, sigma, lots_in_series, failing_pieces, mail_id)
         VALUES (:supplierId, :partId, :characteristic, :lotId, :direction, :lotMean, :ewma, :limit, :sigma, :lots, :failing, :mailId) RETURNING id`,
        {
          type: QueryTypes.SELECT,
          transaction,
          replacements: {
            supplierId,
            partId,
            characteristic,
            lotId: drift.lot.lot.id,
            direction: drift.direction,
            lotMean: drift.lot.mean,
            ewma: drift.lot.ewma,
            limit: drift.limit,
            sigma: view.ewma!.sigma,
            lots: view.lots.length,
            failing: drift.lot.failing,
            mailId: mail.id,
          },
        },
      );
      await recordAudit(
        SYSTEM_ACTOR,
        {
          action: 'supplier.drift-alarm',
          entityType: 'supplier',
          entityId: supplierId,
          after: {
            alarmId: alarm.id,
            partId,
            characteristic,
            lot: lotName(drift.lot.lot.id),
            direction: drift.direction,
            ewma: drift.lot.ewma,
            limit: drift.limit,
            failingPieces: drift.lot.failing,
          },
        },
        transaction,
      );
      raised.push({ id: alarm.id, characteristic, lotId: drift.lot.lot.id });
    }
    return raised;
  });
}

/** Checks every supplier-part with piece results written since the last run, then moves the mark. */
export async function checkDriftSinceLastRun(today = new Date()) {
  const [{ mark, latest }] = await sequelize.query<{ mark: number | null; latest: number | null }>(
    'SELECT (SELECT last_result_id FROM drift_check_mark WHERE id = 1) AS mark, (SELECT max(id) FROM piece_results) AS latest',
    { type: QueryTypes.SELECT },
  );
  if (latest === null || latest === mark) return [];
  const changed = await sequelize.query<{ supplier_id: number; part_id: number }>(
    `SELECT DISTINCT po.supplier_id, l.part_id
       FROM piece_results r JOIN pieces pc ON pc.id = r.piece_id JOIN lots l ON l.id = pc.lot_id
       JOIN purchase_order_lines pol ON pol.id = l.po_line_id JOIN purchase_orders po ON po.id = pol.purchase_order_id
      WHERE r.id > :mark AND r.id <= :latest
      ORDER BY 1, 2`,
    { type: QueryTypes.SELECT, replacements: { mark: mark ?? 0, latest } },
  );
  const raised = [];
  for (const { supplier_id, part_id } of changed) raised.push(...(await checkDrift(supplier_id, part_id, today)));
  await sequelize.query(
    `INSERT INTO drift_check_mark (id, last_result_id, checked_at) VALUES (1, :latest, now())
     ON CONFLICT (id) DO UPDATE SET last_result_id = greatest(drift_check_mark.last_result_id, EXCLUDED.last_result_id), checked_at = now()`,
    { replacements: { latest } },
  );
  return raised;
}

export const driftCheckJob: JobDefinition = {
  queue: QUEUES.supplierDriftCheck,
  schedule: '*/5 * * * *',
  async run() {
    await checkDriftSinceLastRun();
  },
};
