// Stand-in "photos" for the demo parts: a plain studio backdrop with the part's outline, drawn with
// jimp, so the demo shelf has thumbnails without shipping anyone's pictures.
import { Jimp } from 'jimp';

export type Outline = 'ring' | 'box' | 'clip';

export async function demoPhoto(outline: Outline, tint: number): Promise<Buffer> {
  const width = 800;
  const height = 600;
  const image = new Jimp({ width, height, color: 0xe9ededff });
  const cx = width / 2;
  const cy = height / 2;
  const [r, g, b] = [(tint >> 16) & 255, (tint >> 8) & 255, tint & 255];
  image.scan(0, 0, width, height, (x, y, idx) => {
    const dx = x - cx;
    const dy = y - cy;
    const d = Math.hypot(dx, dy);
    const angle = Math.atan2(dy, dx);
    let inside = false;
    if (outline === 'ring') inside = d < 190 && d > 110;
    if (outline === 'clip') inside = d < 170 && d > 120 && Math.abs(angle) > 0.5;
    if (outline === 'box') inside = Math.abs(dx) < 250 && Math.abs(dy) < 140 && Math.hypot(dx - 150, dy) > 40;
    const shade = 1 - y / height / 4;
    const data = image.bitmap.data;
    if (inside) {
      data[idx] = r * shade;
      data[idx + 1] = g * shade;
      data[idx + 2] = b * shade;
    } else if (y > height * 0.8) {
      data[idx] = data[idx + 1] = data[idx + 2] = 200;
    }
  });
  return image.getBuffer('image/jpeg', { quality: 80 });
}
