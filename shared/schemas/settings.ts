import { z } from 'zod';

const REMINDER_DAYS = 'Whole numbers of days from 1 to 365, such as 30, 7';

/** Site-wide settings. The site setting governs whether inspection may switch to reduced
 * (ISO 2859-1 leaves that to the responsible authority). */
export const siteSettingsSchema = z.object({
  siteName: z.string().trim().min(1).max(120),
  reducedInspectionEnabled: z.boolean(),
  // Quality managers are mailed this many days before a calibration's due date, once per number.
  // Typed as "30, 7" in the form; checked as a whole, so the message stands beside its one field.
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
        .array(z.unknown(), { error: REMINDER_DAYS })
        .min(1, 'At least one number of days')
        .max(5, 'At most 5 reminders')
        .refine((days) => days.every((d) => typeof d === 'number' && Number.isInteger(d) && d >= 1 && d <= 365), REMINDER_DAYS)
        .transform((days) => [...new Set(days.filter((d): d is number => typeof d === 'number'))].sort((a, b) => b - a)),
    )
    .default([30, 7]),
});
export type SiteSettings = z.infer<typeof siteSettingsSchema>;
export type SiteSettingsInput = z.input<typeof siteSettingsSchema>;

export const DEFAULT_SITE_SETTINGS: SiteSettings = { siteName: 'Phaselot site', reducedInspectionEnabled: false, calibrationReminderDays: [30, 7] };
