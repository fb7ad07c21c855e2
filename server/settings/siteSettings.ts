import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { DEFAULT_SITE_SETTINGS, siteSettingsSchema, type SiteSettings } from '../../shared/schemas/settings';
import { recordAudit, type AuditActor } from '../audit/record';

export async function readSiteSettings(transaction?: Transaction): Promise<SiteSettings> {
  const [row] = await sequelize.query<{ value: SiteSettings }>('SELECT value FROM site_settings WHERE id = 1', { type: QueryTypes.SELECT, transaction });
  return { ...DEFAULT_SITE_SETTINGS, ...row?.value };
}

export function saveSiteSettings(actor: AuditActor, input: SiteSettings) {
  return inTransaction(async (transaction) => {
    const before = await readSiteSettings(transaction);
    const after = siteSettingsSchema.parse(input);
    await sequelize.query(
      `INSERT INTO site_settings (id, value, updated_at) VALUES (1, :value::jsonb, now())
       ON CONFLICT (id) DO UPDATE SET value = EXCLUDED.value, updated_at = now()`,
      { transaction, replacements: { value: JSON.stringify(after) } },
    );
    await recordAudit(actor, { action: 'settings.update', entityType: 'site-settings', entityId: 1, before, after }, transaction);
    return after;
  });
}
