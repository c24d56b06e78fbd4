import { describe, expect, it } from 'vitest';
import { withPageMeta } from './page-meta';
import { ogImageSvg, renderOgImagePng } from '../../scripts/lib/og-image';
import { imageSize } from 'image-size';

const index =
  '<!doctype html><html><head><title>Lightkeel</title>\n    <meta name="description" content="The app\'s own words." /></head><body><div id="root"></div></body></html>';

describe('each public page is sent with its own title, description and Open Graph tags', () => {
  it('names the sky watch page and points previews at our image, on the public address', () => {
    const html = withPageMeta(index, '/sky-watch', 'https://tern.example/');
    expect(html).toContain('<title>Sky watch — when to see Tern-1 · Lightkeel</title>');
    expect(html).toMatch(/<meta name="description" content="The visible passes of Tern-1 over your place[^"]*" \/>/);
    expect(html).toContain('<meta property="og:image" content="https://tern.example/og/lightkeel.png" />');
    expect(html).toContain('<meta property="og:url" content="https://tern.example/sky-watch" />');
    expect(html).not.toContain('noindex');
    expect(html.match(/<title>/g)).toHaveLength(1);
    // One description: the page's, in place of index.html's.
    expect(html.match(/<meta name="description"/g)).toHaveLength(1);
    expect(html).not.toContain('The app');
  });

  it('matches pages with a handle in the address, escapes the text, and keeps the signed-in areas out of indexes', () => {
    expect(withPageMeta(index, '/dispatches/first-light', 'http://127.0.0.1:3000')).toContain(
      '<title>Dispatch — Tern-1 · Lightkeel</title>',
    );
    expect(withPageMeta(index, '/snapshots/abc', 'http://x')).toContain('Tern-1’s orbit');
    expect(withPageMeta(index, '/console/orbit', 'http://x')).toContain('<meta name="robots" content="noindex" />');
    expect(withPageMeta(index, '/my-support', 'http://x')).toContain('noindex');
    // An unknown address gets the mission's own words, and a crafted path cannot break out of the attribute.
    const odd = withPageMeta(index, '/"><script>', 'http://x');
    expect(odd).not.toContain('<script>');
    expect(odd).toContain('og:url" content="http://x/&quot;&gt;&lt;script&gt;"');
  });

  it('draws a 1200×630 PNG Open Graph image without real names', () => {
    const png = renderOgImagePng();
    expect(png.subarray(1, 4).toString('ascii')).toBe('PNG');
    expect(imageSize(png)).toMatchObject({ width: 1200, height: 630 });
    expect(ogImageSvg()).toContain('fictional demonstration');
  });
});
