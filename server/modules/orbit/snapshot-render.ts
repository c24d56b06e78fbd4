import { existsSync } from 'node:fs';
import { Resvg } from '@resvg/resvg-js';
import { buildSnapshotChart, snapshotSvg, type SnapshotData } from '../../../shared/charts/snapshot-chart';

// resvg reads TTF/OTF only (the web font is WOFF2), so the PNG uses DejaVu Sans from the system's fonts.
const FONT_FILES = ['/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf', '/usr/share/fonts/truetype/dejavu/DejaVuSans-Bold.ttf'].filter((f) =>
  existsSync(f),
);

export function renderSnapshotSvg(snapshot: { title: string; caption: string; data: SnapshotData }): string {
  return snapshotSvg(buildSnapshotChart(snapshot.data, { title: snapshot.title, caption: snapshot.caption }));
}

/** PNG at twice the SVG size, for e-mail and download. */
export function renderSnapshotPng(snapshot: { title: string; caption: string; data: SnapshotData }): Buffer {
  const svg = renderSnapshotSvg(snapshot);
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: 2 },
    font: {
      fontFiles: FONT_FILES,
      loadSystemFonts: FONT_FILES.length === 0,
      defaultFontFamily: 'DejaVu Sans',
      sansSerifFamily: 'DejaVu Sans',
    },
  });
  return resvg.render().asPng();
}
