import { pageMeta } from '../../shared/site-meta';

const OG_IMAGE_PATH = '/og/lightkeel.png';

const escape = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/**
 * The client's index.html with the page's own title, description and Open Graph tags (link previews and search
 * engines read them without running the app). The signed-in areas are marked noindex.
 */
export function withPageMeta(indexHtml: string, pathname: string, publicUrl: string): string {
  const meta = pageMeta(pathname);
  const origin = publicUrl.replace(/\/$/, '');
  const privateArea = /^\/(console|my-support)(\/|$)/.test(pathname);
  const tags = [
    `<title>${escape(meta.fullTitle)}</title>`,
    `<meta name="description" content="${escape(meta.description)}" />`,
    `<meta property="og:type" content="website" />`,
    `<meta property="og:site_name" content="Lightkeel" />`,
    `<meta property="og:title" content="${escape(meta.title)}" />`,
    `<meta property="og:description" content="${escape(meta.description)}" />`,
    `<meta property="og:url" content="${escape(origin + pathname)}" />`,
    `<meta property="og:image" content="${escape(origin + OG_IMAGE_PATH)}" />`,
    `<meta property="og:image:width" content="1200" />`,
    `<meta property="og:image:height" content="630" />`,
    `<meta property="og:image:alt" content="A square solar sail in orbit catching the Sun's light, with the words Tern-1, a solar sail pushed by sunlight" />`,
    `<meta name="twitter:card" content="summary_large_image" />`,
    ...(privateArea ? ['<meta name="robots" content="noindex" />'] : []),
  ].join('\n    ');
  // index.html's own description (what a page without its own words would say) gives way to the page's.
  return indexHtml.replace(/\s*<meta name="description"[^>]*>/g, '').replace(/<title>[^<]*<\/title>/, tags);
}
