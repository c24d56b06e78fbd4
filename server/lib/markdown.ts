import { Marked } from 'marked';
import sanitizeHtml from 'sanitize-html';

// The one Markdown path for dispatches: the desk's live preview, the public page and the e-mail all call
// renderMarkdown(), so what outreach previews is exactly what readers and mail clients get.

const marked = new Marked({ gfm: true, breaks: false, async: false });

// prettier-ignore
const ALLOWED_TAGS = [
  'p', 'br', 'hr', 'h2', 'h3', 'h4', 'strong', 'em', 'del', 'code', 'pre', 'blockquote',
  'ul', 'ol', 'li', 'a', 'img', 'table', 'thead', 'tbody', 'tr', 'th', 'td',
];

function absolute(url: string, baseUrl: string | undefined): string | null {
  try {
    const u = baseUrl ? new URL(url, baseUrl) : new URL(url);
    return u.href;
  } catch {
    return baseUrl ? null : url;
  }
}

function options(baseUrl: string | undefined): sanitizeHtml.IOptions {
  return {
    allowedTags: ALLOWED_TAGS,
    allowedAttributes: {
      a: ['href', 'title', 'rel', 'target'],
      img: ['src', 'alt', 'title', 'width', 'height'],
      th: ['align'],
      td: ['align'],
    },
    // No javascript:, data:, vbscript: or any other scheme; no protocol-relative links (they follow the page's scheme and host).
    allowedSchemes: ['http', 'https', 'mailto'],
    allowedSchemesByTag: { img: ['http', 'https'] },
    allowedSchemesAppliedToAttributes: ['href', 'src', 'cite'],
    allowProtocolRelative: false,
    disallowedTagsMode: 'discard',
    // Content of these is dropped with the tag, not shown as text.
    nonTextTags: ['script', 'style', 'textarea', 'option', 'noscript', 'iframe', 'object', 'embed', 'svg', 'math', 'template'],
    transformTags: {
      // Markdown's "# Heading" would compete with the page title: headings start at h2.
      h1: 'h2',
      h5: 'h4',
      h6: 'h4',
      a: (tagName, attribs) => {
        const href = attribs.href ? absolute(attribs.href, baseUrl) : null;
        const out: Record<string, string> = { rel: 'noopener noreferrer nofollow', target: '_blank' };
        if (href) out.href = href;
        if (attribs.title) out.title = attribs.title;
        return { tagName, attribs: out };
      },
      img: (tagName, attribs) => {
        const src = attribs.src ? absolute(attribs.src, baseUrl) : null;
        const out: Record<string, string> = { alt: attribs.alt ?? '' };
        if (src) out.src = src;
        if (attribs.title) out.title = attribs.title;
        return { tagName, attribs: out };
      },
    },
    exclusiveFilter: (frame) => frame.tag === 'img' && !frame.attribs.src,
  };
}

/** Markdown → sanitised HTML. `baseUrl` turns relative links into absolute ones (needed in e-mail). */
export function renderMarkdown(markdown: string, opts: { baseUrl?: string } = {}): string {
  const raw = marked.parse(markdown) as string;
  // sanitize-html checks schemes after decoding entities and stripping control characters, so
  // "jav&#x09;ascript:" and "JaVaScRiPt:" are refused like "javascript:".
  return sanitizeHtml(raw, options(opts.baseUrl)).trim();
}

const ENTITIES: Record<string, string> = {
  '&amp;': '&',
  '&lt;': '<',
  '&gt;': '>',
  '&quot;': '"',
  '&#39;': "'",
  '&#x27;': "'",
  '&nbsp;': ' ',
};
const decode = (s: string) => s.replace(/&(amp|lt|gt|quot|nbsp|#39|#x27);/g, (m) => ENTITIES[m] ?? m);

/** Sanitised HTML → plain text for the e-mail's text part: paragraphs kept, links written out. */
export function htmlToText(html: string): string {
  const text = html
    .replace(/<a [^>]*href="([^"]*)"[^>]*>([\s\S]*?)<\/a>/g, (_m, href: string, label: string) => {
      const l = label.replace(/<[^>]+>/g, '');
      const h = decode(href);
      return decode(l) === h ? h : `${l} (${h})`;
    })
    .replace(/<img [^>]*alt="([^"]*)"[^>]*>/g, (_m, alt: string) => (alt ? `[image: ${alt}]` : ''))
    .replace(/<li>/g, '\n- ')
    .replace(/<br\s*\/?>/g, '\n')
    .replace(/<\/(p|h2|h3|h4|blockquote|pre|ul|ol|table|tr)>/g, '\n\n')
    .replace(/<hr\s*\/?>/g, '\n---\n')
    .replace(/<[^>]+>/g, '');
  return decode(text)
    .replace(/[ \t]+\n/g, '\n')
    .replace(/\n\s*\n- /g, '\n- ')
    .replace(/\n{3,}/g, '\n\n')
    .trim();
}

/** The first words of the body as plain text, cut at a word boundary. */
export function excerptOf(markdown: string, maxChars = 240): string {
  const text = htmlToText(renderMarkdown(markdown))
    .replace(/\([^)]*https?:\/\/[^)]*\)/g, '')
    .replace(/\[image: [^\]]*\]/g, '')
    .replace(/\s+/g, ' ')
    .trim();
  if (text.length <= maxChars) return text;
  const cut = text.slice(0, maxChars);
  const at = cut.lastIndexOf(' ');
  return `${(at > maxChars * 0.6 ? cut.slice(0, at) : cut).replace(/[\s.,;:!?-]+$/, '')}…`;
}
