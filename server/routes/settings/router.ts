import { Router } from 'express';
import { siteSettingsSchema, type SiteSettings } from '../../../shared/schemas/settings';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { validate } from '../../http/validate';
import { readSiteSettings, saveSiteSettings } from './operations';

export const settingsRouter = Router();

settingsRouter.get('/', authenticate, async (_req, res) => {
  res.json(await readSiteSettings());
});

settingsRouter.put('/', authenticate, allow('settings.manage'), validate({ body: siteSettingsSchema }), async (req, res) => {
  res.json(await saveSiteSettings(actorOf(req), req.valid.body as SiteSettings));
});
