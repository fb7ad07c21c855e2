// The three routes of an editable record: read one, create, replace. Each answers with the record
// as `view` presents it, read again after the write.
import type { Router } from 'express';
import type { z } from 'zod';
import type { Permission } from '../../shared/policies';
import { actorOf, type AuditActor } from '../audit/record';
import { allow, authenticate } from '../auth/authenticate';
import { idParams } from './params';
import { validated } from './validate';

type RecordRoutes<Schema extends z.ZodType> = {
  read: Permission;
  write: Permission;
  schema: Schema;
  view: (id: number) => Promise<unknown>;
  create: (actor: AuditActor, input: z.output<Schema>) => Promise<{ id: number }>;
  update: (actor: AuditActor, id: number, input: z.output<Schema>) => Promise<unknown>;
};

export function mountRecord<Schema extends z.ZodType>(router: Router, routes: RecordRoutes<Schema>) {
  router.get(
    '/:id',
    authenticate,
    allow(routes.read),
    validated({ params: idParams }, async ({ params }, _req, res) => {
      res.json(await routes.view(params.id));
    }),
  );
  router.post(
    '/',
    authenticate,
    allow(routes.write),
    validated({ body: routes.schema }, async ({ body }, req, res) => {
      const created = await routes.create(actorOf(req), body);
      res.status(201).json(await routes.view(created.id));
    }),
  );
  router.put(
    '/:id',
    authenticate,
    allow(routes.write),
    validated({ params: idParams, body: routes.schema }, async ({ params, body }, req, res) => {
      await routes.update(actorOf(req), params.id, body);
      res.json(await routes.view(params.id));
    }),
  );
}
