import { Router } from 'express';
import { allow, authenticate } from '../../auth/authenticate';
import { dashboardOf } from '../../dashboard/dashboard';

export const dashboardRouter = Router();

// Every signed-in user may ask; the answer holds only the sections their roles may read.
dashboardRouter.get('/', authenticate, allow('dashboard.read'), async (req, res) => {
  res.json(await dashboardOf(req.user!));
});
