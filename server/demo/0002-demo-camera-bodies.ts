// Invented camera bodies for the demo scenario (no real makers or models).
import type { SeedFn } from './seed';
import { CameraBody } from '../db/models';

export const DEMO_BODIES = [
  { slug: 'korvel-kx8', maker: 'Korvel', model: 'KX-8', aliases: ['KX8', 'Korvel 8'] },
  { slug: 'korvel-kx4-mini', maker: 'Korvel', model: 'KX-4 Mini', aliases: ['KX4', 'KX Mini'] },
  { slug: 'halden-h6', maker: 'Halden Cine', model: 'H6', aliases: ['Halden 6', 'H-6'] },
  { slug: 'halden-h2-lite', maker: 'Halden Cine', model: 'H2 Lite', aliases: ['H2L', 'Halden Lite'] },
  { slug: 'ostrava-vega-s35', maker: 'Ostrava Imaging', model: 'Vega S35', aliases: ['Vega', 'S35'] },
  { slug: 'marlin-m-cam-4k', maker: 'Marlinworks', model: 'M-Cam 4K', aliases: ['MCam', 'M-Cam'] },
  { slug: 'peregrine-p1', maker: 'Peregrine Digital', model: 'P1 Documentary', aliases: ['P1', 'Peregrine doc'] },
];

export const up: SeedFn = async () => {
  for (const body of DEMO_BODIES) await CameraBody.findOrCreate({ where: { slug: body.slug }, defaults: body });
};
