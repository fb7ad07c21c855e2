// The API's table of contents: one line per resource router.
import { Router } from 'express';
import { auditRouter } from './audit/router';
import { authRouter } from './auth/router';
import { certificatesRouter, documentsRouter } from './certificates/router';
import { exportsRouter } from './exports/router';
import { inspectionRouter } from './inspection/router';
import { healthRouter } from './health/router';
import { instrumentsRouter } from './instruments/router';
import { mailRouter } from './mail/router';
import { settingsRouter } from './settings/router';
import { usersRouter } from './users/router';

export const apiRouter = Router();

apiRouter.use('/health', healthRouter);
apiRouter.use('/auth', authRouter);
apiRouter.use('/users', usersRouter);
apiRouter.use('/mail', mailRouter);
apiRouter.use('/audit', auditRouter);
apiRouter.use('/instruments', instrumentsRouter);
apiRouter.use('/settings', settingsRouter);
apiRouter.use('/inspection', inspectionRouter);
apiRouter.use('/certificates', certificatesRouter);
apiRouter.use('/documents', documentsRouter);
apiRouter.use('/exports', exportsRouter);
