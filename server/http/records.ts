// The three routes of an editable record: read one, create, replace. Each answers with the record
// as `view` presents it, read again after the write.
import type { Router } from 'express';
import type { z } from 'zod';
import type { Permission } from '../../shared/policies';
import { actorOf, type AuditActor } from '../audit/record';
import { allow, authenticate } from '../auth/authenticate';
import { idParams, type IdParams } from './params';
import { validate } from './validate';

type RecordRoutes<Schema extends z.ZodType> = {
  read: Permission;
  write: Permission;
  schema: Schema;
  view: (id: number) => Promise<unknown>;
  create: (actor: AuditActor, input: z.input<Schema>) => Promise<{ id: number }>;
  update: (actor: AuditActor, id: number, input: z.input<Schema>) => Promise<unknown>;
};

export function mountRecord<Schema extends z.ZodType>(router: Router, routes: RecordRoutes<Schema>) {
  router.get('/:id', authenticate, allow(routes.read), validate({ params: idParams }), async (req, res) => {
    res.json(await routes.view((req.valid.params as IdParams).id));
  });
  router.post('/', authenticate, allow(routes.write), validate({ body: routes.schema }), async (req, res) => {
    const created = await routes.create(actorOf(req), req.valid.body as z.input<Schema>);
    res.status(201).json(await routes.view(created.id));
  });
  router.put('/:id', authenticate, allow(routes.write), validate({ params: idParams, body: routes.schema }), async (req, res) => {
    const { id } = req.valid.params as IdParams;
    await routes.update(actorOf(req), id, req.valid.body as z.input<Schema>);
    res.json(await routes.view(id));
  });
}
