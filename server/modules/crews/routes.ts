import { Router } from 'express';
import {
  crewInvitationParamsSchema,
  crewInvitationSchema,
  crewMemberParamsSchema,
  crewMemberPatchSchema,
  crewParamsSchema,
  crewPatchSchema,
  crewSchema,
  invitationTokenParamsSchema,
} from '@shared/schemas/crews';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { CrewsService } from './service';

/** /api/crews: the viewer's crews, their members and invitations. */
export function crewRoutes(crews: CrewsService) {
  const router = Router();
  router.use(requireAuth);
  const params = crewParamsSchema;

  router.get('/', async (req, res) => {
    res.json({ items: await crews.list(currentUser(req)!) });
  });
  router.post(
    '/',
    handler({ body: crewSchema }, async ({ body }, req, res) => {
      const crew = await crews.create(currentUser(req)!, body);
      res.status(201).location(`/api/crews/${crew.id}`).json(crew);
    }),
  );
  router.get(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await crews.get(currentUser(req)!, params.id));
    }),
  );
  router.patch(
    '/:id',
    handler({ params, body: crewPatchSchema }, async ({ params, body }, req, res) => {
      res.json(await crews.update(currentUser(req)!, params.id, body));
    }),
  );
  router.delete(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      await crews.remove(currentUser(req)!, params.id);
      res.status(204).end();
    }),
  );
  router.post(
    '/:id/invitations',
    handler({ params, body: crewInvitationSchema }, async ({ params, body }, req, res) => {
      const invitation = await crews.invite(currentUser(req)!, params.id, body);
      res.status(201).json(invitation);
    }),
  );
  router.delete(
    '/:id/invitations/:invitationId',
    handler({ params: crewInvitationParamsSchema }, async ({ params }, req, res) => {
      await crews.withdrawInvitation(currentUser(req)!, params.id, params.invitationId);
      res.status(204).end();
    }),
  );
  router.patch(
    '/:id/members/:userId',
    handler({ params: crewMemberParamsSchema, body: crewMemberPatchSchema }, async ({ params, body }, req, res) => {
      res.json(await crews.setMemberRole(currentUser(req)!, params.id, params.userId, body.role));
    }),
  );
  router.delete(
    '/:id/members/:userId',
    handler({ params: crewMemberParamsSchema }, async ({ params }, req, res) => {
      await crews.removeMember(currentUser(req)!, params.id, params.userId);
      res.status(204).end();
    }),
  );
  return router;
}

/** /api/invitations/:token: what a crew invitation offers, and accepting it. */
export function invitationRoutes(crews: CrewsService) {
  const router = Router();
  const params = invitationTokenParamsSchema;
  router.get(
    '/:token',
    handler({ params }, async ({ params }, _req, res) => {
      res.json(await crews.previewInvitation(params.token));
    }),
  );
  router.post(
    '/:token/accept',
    requireAuth,
    handler({ params }, async ({ params }, req, res) => {
      res.json(await crews.accept(currentUser(req)!, params.token));
    }),
  );
  return router;
}
