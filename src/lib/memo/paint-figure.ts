/**
 * Painters of a laid-out figure: as SVG text (the HTML preview and the DOCX) and as a PNG (the
 * DOCX's fallback for word processors without SVG). Text is left out of the PNG: the caption and
 * the SVG carry it.
 */
import { PNG } from 'pngjs';
import type { FigureDrawing } from './figure-layout';

function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (character) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[character] ?? character);
}

const round = (value: number) => Math.round(value * 100) / 100;

/**
 * The drawing as an SVG document.
 * @param drawing the laid-out figure.
 * @param title an accessible title (the figure's caption).
 * @returns SVG text with width and height in points.
 */
export function figureSvg(drawing: FigureDrawing, title: string): string {
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${round(drawing.width)}pt" height="${round(drawing.height)}pt" viewBox="0 0 ${round(drawing.width)} ${round(drawing.height)}" role="img" font-family="'Source Sans 3', 'Source Sans Pro', Arial, sans-serif">`,
    `<title>${escapeXml(title)}</title>`,
  ];
  for (const shape of drawing.shapes) {
    if (shape.kind === 'rect') {
      parts.push(`<rect x="${round(shape.x)}" y="${round(shape.y)}" width="${round(shape.w)}" height="${round(shape.h)}" fill="${shape.fill}"/>`);
    } else if (shape.kind === 'line') {
      const points = shape.points.map(([x, y]) => `${round(x)},${round(y)}`).join(' ');
      const dash = shape.dash ? ` stroke-dasharray="${shape.dash.join(' ')}"` : '';
      parts.push(`<polyline points="${points}" fill="none" stroke="${shape.stroke}" stroke-width="${shape.width}"${dash}/>`);
    } else if (shape.kind === 'circle') {
      parts.push(`<circle cx="${round(shape.cx)}" cy="${round(shape.cy)}" r="${shape.r}" fill="${shape.fill}"/>`);
    } else {
      const rotate = shape.rotate ? ` transform="rotate(${shape.rotate} ${round(shape.x)} ${round(shape.y)})"` : '';
      parts.push(`<text x="${round(shape.x)}" y="${round(shape.y)}" font-size="${round(shape.size)}" text-anchor="${shape.anchor}" fill="${shape.fill}"${rotate}>${escapeXml(shape.text)}</text>`);
    }
  }
  parts.push('</svg>');
  return parts.join('');
}

function parseHex(colour: string): [number, number, number] {
  const hex = /^#([0-9a-f]{6})$/i.exec(colour)?.[1] ?? '000000';
  return [parseInt(hex.slice(0, 2), 16), parseInt(hex.slice(2, 4), 16), parseInt(hex.slice(4, 6), 16)];
}

/**
 * The drawing as a PNG, without its text.
 * @param drawing the laid-out figure.
 * @param pixelsPerPoint resolution (2 gives 144 dpi).
 * @returns the PNG file's bytes.
 */
export function figurePng(drawing: FigureDrawing, pixelsPerPoint = 2): Buffer {
  const width = Math.max(1, Math.ceil(drawing.width * pixelsPerPoint));
  const height = Math.max(1, Math.ceil(drawing.height * pixelsPerPoint));
  const png = new PNG({ width, height, filterType: 0, deflateLevel: 6 });
  png.data.fill(255);
  const data = png.data;
  const fill = (x0: number, y0: number, x1: number, y1: number, rgb: [number, number, number]) => {
    const left = Math.max(0, Math.floor(x0));
    const top = Math.max(0, Math.floor(y0));
    const right = Math.min(width, Math.ceil(x1));
    const bottom = Math.min(height, Math.ceil(y1));
    for (let y = top; y < bottom; y += 1) {
      for (let x = left; x < right; x += 1) {
        const offset = (y * width + x) * 4;
        data[offset] = rgb[0];
        data[offset + 1] = rgb[1];
        data[offset + 2] = rgb[2];
        data[offset + 3] = 255;
      }
    }
  };
  for (const shape of drawing.shapes) {
    if (shape.kind === 'rect') {
      fill(shape.x * pixelsPerPoint, shape.y * pixelsPerPoint, (shape.x + shape.w) * pixelsPerPoint, (shape.y + shape.h) * pixelsPerPoint, parseHex(shape.fill));
    } else if (shape.kind === 'circle') {
      const rgb = parseHex(shape.fill);
      const cx = shape.cx * pixelsPerPoint;
      const cy = shape.cy * pixelsPerPoint;
      const r = shape.r * pixelsPerPoint;
      for (let y = Math.floor(cy - r); y <= Math.ceil(cy + r); y += 1) {
        const half = Math.sqrt(Math.max(0, r * r - (y + 0.5 - cy) ** 2));
        fill(cx - half, y, cx + half, y + 1, rgb);
      }
    } else if (shape.kind === 'line') {
      const rgb = parseHex(shape.stroke);
      const half = Math.max(0.5, (shape.width * pixelsPerPoint) / 2);
      for (let segment = 1; segment < shape.points.length; segment += 1) {
        const [ax, ay] = shape.points[segment - 1];
        const [bx, by] = shape.points[segment];
        const length = Math.hypot(bx - ax, by - ay) * pixelsPerPoint;
        const steps = Math.max(1, Math.ceil(length));
        for (let step = 0; step <= steps; step += 1) {
          if (shape.dash) {
            const along = (step / pixelsPerPoint) % (shape.dash[0] + shape.dash[1]);
            if (along > shape.dash[0]) continue;
          }
          const x = (ax + ((bx - ax) * step) / steps) * pixelsPerPoint;
          const y = (ay + ((by - ay) * step) / steps) * pixelsPerPoint;
          fill(x - half, y - half, x + half, y + half, rgb);
        }
      }
    }
  }
  return PNG.sync.write(png, { filterType: 0, deflateLevel: 6 });
}
