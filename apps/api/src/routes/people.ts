import { Router } from 'express';
import { changeRoleSchema, idParamsSchema, inviteSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { PeopleService } from '../services/people-service.js';

export function peopleRouter(people: PeopleService): Router {
  const router = Router();
  router.get('/', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await people.list(actor));
  }));
  router.post('/invite', ...endpoint({ body: inviteSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await people.invite(actor, body));
  }));
  router.patch('/:id', ...endpoint({ params: idParamsSchema, body: changeRoleSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await people.changeRole(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await people.remove(actor, params.id);
    res.status(204).end();
  }));
  return router;
}
