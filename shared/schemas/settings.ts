import { z } from 'zod';

/** Site-wide settings. The site setting governs whether inspection may switch to reduced
 * (ISO 2859-1 leaves that to the responsible authority). */
export const siteSettingsSchema = z.object({
  siteName: z.string().trim().min(1).max(120),
  reducedInspectionEnabled: z.boolean(),
  // Quality managers are mailed this many days before a calibration's due date, once per number.
  calibrationReminderDays: z
    .preprocess(
      (v) =>
        typeof v === 'string'
          ? v
              .split(/[\s,;]+/)
              .filter(Boolean)
              .map(Number)
          : v,
      z
        .array(z.number({ error: 'Whole numbers of days, such as 30, 7' }).int('Whole numbers of days').min(1, 'At least 1 day').max(365, 'At most 365 days'), {
          error: 'Whole numbers of days, such as 30, 7',
        })
        .min(1, 'At least one number of days')
        .max(5, 'At most 5 reminders')
        .transform((days) => [...new Set(days)].sort((a, b) => b - a)),
    )
    .default([30, 7]),
});
export type SiteSettings = z.infer<typeof siteSettingsSchema>;
export type SiteSettingsInput = z.input<typeof siteSettingsSchema>;

export const DEFAULT_SITE_SETTINGS: SiteSettings = { siteName: 'Phaselot site', reducedInspectionEnabled: false, calibrationReminderDays: [30, 7] };
