import { Router } from 'express';
import { CATEGORIES, MOUNT_STANDARDS, SAFETY_FLAGS } from '@shared/catalogue';
import { LICENCE_IDS, licenceInfo } from '@shared/licences';
import { MATERIAL_IDS, materialInfo } from '@shared/materials';
import { CameraBody } from '../../db/models';

export function vocabRoutes() {
  const router = Router();
  router.get('/', async (_req, res) => {
    const bodies = await CameraBody.findAll({
      order: [
        ['maker', 'ASC'],
        ['model', 'ASC'],
      ],
    });
    res.setHeader('Cache-Control', 'private, max-age=60');
    res.json({
      categories: CATEGORIES,
      mounts: MOUNT_STANDARDS,
      bodies: bodies.map((b) => b.toInfo()),
      materials: MATERIAL_IDS.map((id) => materialInfo(id)),
      licences: LICENCE_IDS.map((id) => {
        const l = licenceInfo(id);
        return {
          id,
          name: l.name,
          shortName: l.shortName,
          url: l.url,
          attributionRequired: l.attributionRequired,
          shareAlike: l.shareAlike,
          nonCommercial: l.nonCommercial,
          noDerivatives: l.noDerivatives,
        };
      }),
      safetyFlags: SAFETY_FLAGS,
    });
  });
  return router;
}
