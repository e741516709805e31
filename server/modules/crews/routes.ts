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
import { parsed, validate } from '../../middleware/validate';
import type { CrewsService } from './service';

/** /api/crews: the viewer's crews, their members and invitations. */
export function crewRoutes(crews: CrewsService) {
  const router = Router();
  router.use(requireAuth);
  const crewParams = validate('params', crewParamsSchema);
  const memberParams = validate('params', crewMemberParamsSchema);

  router.get('/', async (req, res) => {
    res.json({ items: await crews.list(currentUser(req)!) });
  });
  router.post('/', validate('body', crewSchema), async (req, res) => {
    const crew = await crews.create(currentUser(req)!, parsed(res, 'body', crewSchema));
    res.status(201).location(`/api/crews/${crew.id}`).json(crew);
  });
  router.get('/:id', crewParams, async (req, res) => {
    res.json(await crews.get(currentUser(req)!, parsed(res, 'params', crewParamsSchema).id));
  });
  router.patch('/:id', crewParams, validate('body', crewPatchSchema), async (req, res) => {
    res.json(await crews.update(currentUser(req)!, parsed(res, 'params', crewParamsSchema).id, parsed(res, 'body', crewPatchSchema)));
  });
  router.delete('/:id', crewParams, async (req, res) => {
    await crews.remove(currentUser(req)!, parsed(res, 'params', crewParamsSchema).id);
    res.status(204).end();
  });
  router.post('/:id/invitations', crewParams, validate('body', crewInvitationSchema), async (req, res) => {
    const invitation = await crews.invite(currentUser(req)!, parsed(res, 'params', crewParamsSchema).id, parsed(res, 'body', crewInvitationSchema));
    res.status(201).json(invitation);
  });
  router.delete('/:id/invitations/:invitationId', validate('params', crewInvitationParamsSchema), async (req, res) => {
    const { id, invitationId } = parsed(res, 'params', crewInvitationParamsSchema);
    await crews.withdrawInvitation(currentUser(req)!, id, invitationId);
    res.status(204).end();
  });
  router.patch('/:id/members/:userId', memberParams, validate('body', crewMemberPatchSchema), async (req, res) => {
    const { id, userId } = parsed(res, 'params', crewMemberParamsSchema);
    res.json(await crews.setMemberRole(currentUser(req)!, id, userId, parsed(res, 'body', crewMemberPatchSchema).role));
  });
  router.delete('/:id/members/:userId', memberParams, async (req, res) => {
    const { id, userId } = parsed(res, 'params', crewMemberParamsSchema);
    await crews.removeMember(currentUser(req)!, id, userId);
    res.status(204).end();
  });
  return router;
}

/** /api/invitations/:token: what a crew invitation offers, and accepting it. */
export function invitationRoutes(crews: CrewsService) {
  const router = Router();
  const tokenParams = validate('params', invitationTokenParamsSchema);
  router.get('/:token', tokenParams, async (_req, res) => {
    res.json(await crews.previewInvitation(parsed(res, 'params', invitationTokenParamsSchema).token));
  });
  router.post('/:token/accept', requireAuth, tokenParams, async (req, res) => {
    res.json(await crews.accept(currentUser(req)!, parsed(res, 'params', invitationTokenParamsSchema).token));
  });
  return router;
}
