import { z } from 'zod';

/** Site-wide settings. The site setting governs whether inspection may switch to reduced
 * (ISO 2859-1 leaves that to the responsible authority). */
export const siteSettingsSchema = z.object({
  siteName: z.string().trim().min(1).max(120),
  reducedInspectionEnabled: z.boolean(),
});
export type SiteSettings = z.infer<typeof siteSettingsSchema>;

export const DEFAULT_SITE_SETTINGS: SiteSettings = { siteName: 'Phaselot site', reducedInspectionEnabled: false };
