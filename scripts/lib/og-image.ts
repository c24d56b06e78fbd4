// The Open Graph image of the public pages: drawn here as SVG (our own artwork: the night sky, the sail, the
// Sun's rays) and turned into a 1200×630 PNG by resvg when the client is built (vite.config.ts emits it as
// og/lightkeel.png). No real mission, organisation or brand appears in it.
import { existsSync } from 'node:fs';
import { Resvg } from '@resvg/resvg-js';

// resvg reads TTF/OTF only (the web font is WOFF2): DejaVu Sans from the system, as the snapshot PNGs use.
const FONT_FILES = ['/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf', '/usr/share/fonts/truetype/dejavu/DejaVuSans-Bold.ttf'].filter((f) =>
  existsSync(f),
);

export const OG_IMAGE_PATH = '/og/lightkeel.png';
export const OG_IMAGE_SIZE = { width: 1200, height: 630 };

export function ogImageSvg(): string {
  const stars = Array.from({ length: 60 }, (_, i) => {
    // A fixed scatter (no randomness: the same build gives the same image).
    const x = (i * 397) % 1200;
    const y = (i * 211) % 630;
    const r = 0.8 + ((i * 7) % 5) * 0.3;
    return `<circle cx="${x}" cy="${y}" r="${r}" fill="#d6def2" opacity="${0.25 + ((i * 13) % 6) / 10}"/>`;
  }).join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="630" viewBox="0 0 1200 630">
  <defs>
    <radialGradient id="sky" cx="0.8" cy="0.1" r="1"><stop offset="0" stop-color="#263a7a"/><stop offset="0.6" stop-color="#0b1431"/><stop offset="1" stop-color="#060b1f"/></radialGradient>
    <radialGradient id="glow" cx="0.5" cy="0.5" r="0.5"><stop offset="0" stop-color="#ffd27a" stop-opacity="0.6"/><stop offset="1" stop-color="#ffd27a" stop-opacity="0"/></radialGradient>
    <linearGradient id="fa" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="#eceff3"/><stop offset="1" stop-color="#7b879b"/></linearGradient>
    <linearGradient id="fb" x1="1" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#bcc4d1"/><stop offset="1" stop-color="#454c58"/></linearGradient>
  </defs>
  <rect width="1200" height="630" fill="url(#sky)"/>
  ${stars}
  <circle cx="1040" cy="120" r="150" fill="url(#glow)"/>
  <circle cx="1040" cy="120" r="34" fill="#ffbe45"/>
  <g stroke="#ffbe45" stroke-opacity="0.55" stroke-width="4" stroke-dasharray="10 14">
    <line x1="1000" y1="160" x2="930" y2="230"/><line x1="975" y1="185" x2="880" y2="280"/><line x1="1025" y1="170" x2="960" y2="260"/>
  </g>
  <ellipse cx="850" cy="360" rx="300" ry="80" fill="none" stroke="#5069b3" stroke-opacity="0.7" stroke-width="3" stroke-dasharray="6 14"/>
  <g transform="translate(850 350) rotate(-14)">
    <path d="M0 -170 L170 0 L0 0 Z" fill="url(#fa)"/><path d="M170 0 L0 170 L0 0 Z" fill="url(#fb)"/>
    <path d="M0 170 L-170 0 L0 0 Z" fill="url(#fa)" opacity="0.85"/><path d="M-170 0 L0 -170 L0 0 Z" fill="url(#fb)"/>
    <path d="M0 -170 V170 M-170 0 H170" stroke="#f7f8fa" stroke-width="3"/>
    <rect x="-13" y="-13" width="26" height="26" rx="4" fill="#131f47" stroke="#d9dee6" stroke-width="3"/>
  </g>
  <g font-family="DejaVu Sans, sans-serif">
    <text x="72" y="120" font-size="30" font-weight="bold" fill="#ffbe45" letter-spacing="4">LIGHTKEEL</text>
    <text x="72" y="250" font-size="64" font-weight="bold" fill="#f7f8fa">Tern-1</text>
    <text x="72" y="320" font-size="40" fill="#d9dee6">A solar sail pushed</text>
    <text x="72" y="372" font-size="40" fill="#d9dee6">by sunlight</text>
    <text x="72" y="540" font-size="26" fill="#98a3b5">Flight budget · orbit status · sky watch</text>
    <text x="72" y="580" font-size="20" fill="#7b879b">A fictional demonstration mission</text>
  </g>
</svg>`;
}

export function renderOgImagePng(): Buffer {
  const resvg = new Resvg(ogImageSvg(), {
    fitTo: { mode: 'width', value: OG_IMAGE_SIZE.width },
    font: { fontFiles: FONT_FILES, loadSystemFonts: FONT_FILES.length === 0, defaultFontFamily: 'DejaVu Sans' },
  });
  return resvg.render().asPng();
}
