// Stand-in worker tasks for the model-picture jobs: the answer is chosen by the job's source path.
import { writeFile } from 'node:fs/promises';
import type { RenderJob, RenderResult } from '../../server/modules/files/render-model';

export async function renderModel(job: RenderJob): Promise<RenderResult> {
  // the outputs are written first, as a real try that fails late would leave them
  await writeFile(job.display, 'partial');
  await writeFile(job.thumbnail, 'partial');
  if (job.source.includes('permanent')) return { ok: false, error: 'the model cannot be read for a picture', permanent: true };
  if (job.source.includes('crash')) process.exit(1);
  return { ok: false, error: 'the task took longer than 120 s and was stopped', permanent: false };
}
