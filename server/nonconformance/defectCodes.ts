// The site's catalogue of defect codes, kept by quality managers. Codes are never deleted: one no
// longer wanted is retired (inactive), so NCRs that name it still read it.
import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { DefectCode } from '../../db/models';
import { defectCodeInputSchema, type DefectCodeInput, type DefectCodeView } from '../../shared/schemas/nonconformance';
import { recordAudit, type AuditActor } from '../audit/record';
import { notFound } from '../http/errors';

export async function listDefectCodes(): Promise<DefectCodeView[]> {
  const rows = await sequelize.query<DefectCodeView>(
    `SELECT c.id, c.code, c.label, c.active, (SELECT count(*)::int FROM nonconformance_defects d WHERE d.defect_code_id = c.id) AS "inUse"
       FROM defect_codes c ORDER BY c.active DESC, c.id`,
    { type: QueryTypes.SELECT },
  );
  return rows;
}

const present = (c: DefectCode) => ({ id: c.id, code: c.code, label: c.label, active: c.active });

export function createDefectCode(actor: AuditActor, rawInput: DefectCodeInput) {
  const input = defectCodeInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const code = await DefectCode.create(input, { transaction });
    await recordAudit(actor, { action: 'defect-code.created', entityType: 'defect-code', entityId: code.id, after: present(code) }, transaction);
    return code;
  });
}

export function updateDefectCode(actor: AuditActor, id: number, rawInput: DefectCodeInput) {
  const input = defectCodeInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const code = await DefectCode.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!code) throw notFound('Defect code');
    const before = present(code);
    await code.update(input, { transaction });
    await recordAudit(actor, { action: 'defect-code.updated', entityType: 'defect-code', entityId: id, before, after: present(code) }, transaction);
    return code;
  });
}
