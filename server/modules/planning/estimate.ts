// One print estimate: from a model file on the shelf (sliced in the worker) or from figures typed in.
import { Op } from 'sequelize';
import type { EstimateResult } from '@shared/api/planning';
import {
  DEFAULT_PRICE_PER_KG,
  estimateFromSlices,
  estimatePrint,
  lineWidthFor,
  type PartGeometry,
  type PrintEstimate,
  type PrintSettings,
} from '@shared/estimate';
import type { ModelFileAnalysis } from '@shared/mesh';
import type { SliceProfile } from '@shared/slice';
import type { EstimateInput } from '@shared/schemas/planning';
import { Part, PartFile, PartRevision, PriceSheet, RevisionFile, type User } from '../../db/models';
import { AppError } from '../../errors';
import { keysOf } from '../files/stored-files';
import { findVisiblePart, seesUnpublished } from '../parts/access';
import type { PlanningDeps } from './service';
import { soundnessNotes } from './values';

const noFile = () => AppError.notFound('There is no model file with that id on the shelf.');

async function visibleModelFile(viewer: User | undefined, fileId: number): Promise<PartFile> {
  const file = await PartFile.findByPk(fileId);
  if (!file) throw noFile();
  let part: Part;
  try {
    part = await findVisiblePart(viewer, file.partId);
  } catch (err) {
    if (err instanceof AppError && err.status === 404) throw noFile();
    throw err;
  }
  const revisionIds = seesUnpublished(viewer, part)
    ? (await PartRevision.findAll({ where: { partId: part.id }, attributes: ['id'] })).map((r) => r.id)
    : [part.publishedRevisionId!];
  const linked = await RevisionFile.count({ where: { fileId, revisionId: { [Op.in]: revisionIds } } });
  if (!linked) throw noFile();
  if (file.kind !== 'model') {
    throw AppError.field('fileId', `That file is a ${file.kind === 'photo' ? 'photo' : 'source file'}, not a model; choose the part’s STL or 3MF file.`);
  }
  if (!file.analysis) throw AppError.field('fileId', 'That model file has no mesh figures, so there is nothing to estimate from.');
  return file;
}

export function estimateService({ storage, slicer }: Pick<PlanningDeps, 'storage' | 'slicer'>) {
  return {
    async estimate(viewer: User | undefined, input: EstimateInput): Promise<EstimateResult> {
      const notes: string[] = [];
      let geometry: PartGeometry;
      let source: EstimateResult['geometry'];
      let sliceFor: ((settings: PrintSettings) => Promise<SliceProfile>) | null = null;
      if (input.fileId !== undefined) {
        const file = await visibleModelFile(viewer, input.fileId);
        const a = file.analysis!;
        const stlUnitScale = (a as Partial<ModelFileAnalysis>).unitScale ?? 1;
        sliceFor = (s) =>
          slicer.slice(
            {
              path: () => storage.localCopy(keysOf(file).original),
              stlUnitScale,
              settings: { layerMm: s.layerMm, walls: s.walls, lineWidthMm: lineWidthFor(s), skinLayers: s.topBottomLayers },
            },
            `file:${file.id}:${file.sha256}`,
          );
        geometry = { volumeMm3: a.volumeMm3, areaMm2: a.areaMm2, sizeMm: a.sizeMm };
        source = { source: 'file', fileId: file.id, partId: file.partId, volumeMm3: a.volumeMm3, areaMm2: a.areaMm2, sizeMm: a.sizeMm };
        notes.push(...soundnessNotes(file.originalName, a));
      } else {
        geometry = { volumeMm3: input.volumeMm3!, areaMm2: input.areaMm2!, sizeMm: input.sizeMm! };
        source = { source: 'figures', fileId: null, partId: null, ...geometry };
      }
      const sheet = viewer ? await PriceSheet.findByPk(viewer.id) : null;
      const ownPrice = sheet?.pricesPerKg[input.material];
      const pricePerKg = input.pricePerKg ?? ownPrice;
      const pricePerKwh = input.pricePerKwh ?? sheet?.pricePerKwh ?? undefined;
      if (input.pricePerKg === undefined && ownPrice !== undefined) notes.push('The price per kg is from your price sheet.');
      if (input.pricePerKwh === undefined && pricePerKwh !== undefined && input.printerWatts !== undefined)
        notes.push('The price per kWh is from your price sheet.');
      const settings: PrintSettings = {
        material: input.material,
        nozzleMm: input.nozzleMm,
        layerMm: input.layerMm,
        walls: input.walls,
        topBottomLayers: input.topBottomLayers,
        infillPct: input.infillPct,
        speedMmS: input.speedMmS,
        accelerationMmS2: input.accelerationMmS2,
        travelSpeedMmS: input.travelSpeedMmS,
        pricePerKg,
        printerWatts: input.printerWatts,
        pricePerKwh,
      };
      let estimate: PrintEstimate;
      try {
        const profile = sliceFor
          ? await sliceFor(settings).catch((err: Error) => {
              notes.push(`The model could not be sliced (${err.message}); this is the quick estimate from its figures.`);
              return null;
            })
          : null;
        estimate = profile ? estimateFromSlices(profile, settings) : estimatePrint(geometry, settings);
      } catch (err) {
        if (err instanceof RangeError) throw new AppError(422, 'validation_failed', `These figures cannot be estimated: ${err.message}`);
        throw err;
      }
      return {
        volumeMm3: estimate.volumeMm3,
        massG: estimate.massG,
        lengthM: estimate.lengthM,
        timeMin: estimate.timeMin,
        cost: estimate.cost,
        pricePerKg: pricePerKg ?? DEFAULT_PRICE_PER_KG[input.material],
        partsMm3: estimate.partsMm3,
        method: estimate.method,
        assumptions: [...estimate.assumptions, ...notes],
        geometry: source,
      };
    },
  };
}
