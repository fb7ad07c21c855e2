import { Router } from 'express';
import { siteSettingsSchema } from '../../../shared/schemas/settings';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { validated } from '../../http/validate';
import { readSiteSettings, saveSiteSettings } from '../../settings/siteSettings';

export const settingsRouter = Router();

settingsRouter.get('/', authenticate, async (_req, res) => {
  res.json(await readSiteSettings());
});

settingsRouter.put(
  '/',
  authenticate,
  allow('settings.manage'),
  validated({ body: siteSettingsSchema }, async ({ body }, req, res) => {
    res.json(await saveSiteSettings(actorOf(req), body));
  }),
);
