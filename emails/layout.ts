import { escapeHtml } from './escape';
import { htmlToText, renderMarkdown } from '../server/lib/markdown';
import { emailTheme as t } from './theme';

/** One block of an e-mail body; the same blocks produce the HTML and the text part. */
export type EmailBlock =
  | { kind: 'paragraph'; text: string }
  | { kind: 'button'; label: string; url: string }
  | { kind: 'facts'; rows: Array<{ label: string; value: string }> }
  | { kind: 'note'; text: string }
  /** Markdown written by staff, through the one sanitiser the web pages use; links made absolute against baseUrl. */
  | { kind: 'markdown'; markdown: string; baseUrl: string }
  /** An image by URL (batch mail carries no attachments), with its alt text, caption and an optional caution line. */
  | { kind: 'image'; src: string; alt: string; caption?: string; caution?: string; width?: number };

export interface EmailContent {
  subject: string;
  /** Short line shown by mail clients beside the subject. */
  preview: string;
  heading: string;
  blocks: EmailBlock[];
  /** Why the reader receives this message; shown in the footer of both parts. */
  reason: string;
  /** Non-transactional mail: a signed one-click link that stops this category. */
  unsubscribeUrl?: string;
  /** The reader's e-mail choices page. */
  choicesUrl?: string;
}

function blockToMjml(block: EmailBlock): string {
  switch (block.kind) {
    case 'paragraph':
      return `<mj-text>${escapeHtml(block.text)}</mj-text>`;
    case 'note':
      return `<mj-text font-size="13px" color="${t.silverDeep}" css-class="lk-note">${escapeHtml(block.text)}</mj-text>`;
    case 'button':
      return [
        `<mj-button href="${escapeHtml(block.url)}" background-color="${t.amber}" color="${t.night}" font-weight="700" border-radius="6px" inner-padding="12px 24px" align="left">${escapeHtml(block.label)}</mj-button>`,
        // The raw link too, for clients that hide buttons or readers who copy it.
        `<mj-text font-size="13px" color="${t.silverDeep}">If the button does not work, open this link: <a href="${escapeHtml(block.url)}" style="color:${t.nightSoft};word-break:break-all">${escapeHtml(block.url)}</a></mj-text>`,
      ].join('\n');
    case 'facts':
      return `<mj-table cellpadding="6px" font-size="15px">${block.rows
        .map(
          (row) =>
            `<tr><th scope="row" style="text-align:left;color:${t.silverDeep};font-weight:400;padding:6px 12px 6px 0">${escapeHtml(row.label)}</th><td style="padding:6px 0;font-weight:700">${escapeHtml(row.value)}</td></tr>`,
        )
        .join('')}</mj-table>`;
    case 'markdown':
      return `<mj-text css-class="lk-md">${renderMarkdown(block.markdown, { baseUrl: block.baseUrl })}</mj-text>`;
    case 'image':
      return [
        `<mj-image src="${escapeHtml(block.src)}" alt="${escapeHtml(block.alt)}" width="${block.width ?? 552}px" padding="8px 25px 4px" />`,
        block.caption ? `<mj-text font-size="14px" color="${t.ink}" padding-top="2px">${escapeHtml(block.caption)}</mj-text>` : '',
        block.caution
          ? `<mj-text font-size="12px" color="${t.silverDeep}" padding-top="0" css-class="lk-caution">${escapeHtml(block.caution)}</mj-text>`
          : '',
      ]
        .filter(Boolean)
        .join('\n');
  }
}

function footerLinksMjml(content: EmailContent): string {
  const links: string[] = [];
  if (content.unsubscribeUrl)
    links.push(`<a href="${escapeHtml(content.unsubscribeUrl)}" style="color:${t.night}">Unsubscribe from these e-mails</a>`);
  if (content.choicesUrl) links.push(`<a href="${escapeHtml(content.choicesUrl)}" style="color:${t.night}">Your e-mail choices</a>`);
  return links.length ? `<mj-text font-size="12px" color="${t.night}" padding-top="0">${links.join(' · ')}</mj-text>` : '';
}

export function layoutMjml(content: EmailContent): string {
  return `<mjml lang="en">
  <mj-head>
    <mj-title>${escapeHtml(content.subject)}</mj-title>
    <mj-preview>${escapeHtml(content.preview)}</mj-preview>
    <mj-attributes>
      <mj-all font-family="${t.fontFamily}" />
      <mj-text font-size="16px" line-height="1.55" color="${t.ink}" />
    </mj-attributes>
  </mj-head>
  <mj-body background-color="${t.page}" width="600px">
    <mj-section background-color="${t.night}" padding="20px 24px" border-bottom="4px solid ${t.amber}">
      <mj-column>
        <mj-text font-size="22px" font-weight="700" letter-spacing="1px" color="${t.silver}" padding="0">Lightkeel</mj-text>
      </mj-column>
    </mj-section>
    <mj-section background-color="${t.paper}" padding="24px 12px 8px">
      <mj-column>
        <mj-text font-size="22px" font-weight="700" color="${t.night}">${escapeHtml(content.heading)}</mj-text>
        ${content.blocks.map(blockToMjml).join('\n        ')}
      </mj-column>
    </mj-section>
    <mj-section background-color="${t.silver}" padding="16px 12px">
      <mj-column>
        <mj-text font-size="12px" line-height="1.5" color="${t.night}">${escapeHtml(content.reason)}</mj-text>
        ${footerLinksMjml(content)}
        <mj-text font-size="12px" color="${t.nightSoft}" padding-top="0">Sent by Lightkeel on behalf of your mission team.</mj-text>
      </mj-column>
    </mj-section>
  </mj-body>
</mjml>`;
}

function wrap(text: string, width = 72): string {
  const out: string[] = [];
  for (const paragraph of text.split('\n')) {
    let line = '';
    for (const word of paragraph.split(/\s+/).filter(Boolean)) {
      if (line && line.length + 1 + word.length > width) {
        out.push(line);
        line = word;
      } else {
        line = line ? `${line} ${word}` : word;
      }
    }
    out.push(line);
  }
  return out.join('\n');
}

export function layoutText(content: EmailContent): string {
  const parts: string[] = ['LIGHTKEEL', '', content.heading, '='.repeat(Math.min(content.heading.length, 72)), ''];
  for (const block of content.blocks) {
    switch (block.kind) {
      case 'paragraph':
      case 'note':
        parts.push(wrap(block.text), '');
        break;
      case 'button':
        // URLs stay on one line so they remain clickable in plain-text readers.
        parts.push(`${block.label}:`, block.url, '');
        break;
      case 'markdown':
        parts.push(htmlToText(renderMarkdown(block.markdown, { baseUrl: block.baseUrl })), '');
        break;
      case 'image':
        // Only orbit charts carry the caution line; a hero image is a picture, not a chart.
        parts.push(`[${block.caution ? 'Chart' : 'Image'}: ${block.alt}]`, block.src);
        if (block.caption) parts.push(wrap(block.caption));
        if (block.caution) parts.push(wrap(block.caution));
        parts.push('');
        break;
      case 'facts': {
        const width = Math.max(...block.rows.map((r) => r.label.length));
        for (const row of block.rows) parts.push(`${`${row.label}:`.padEnd(width + 2)}${row.value}`);
        parts.push('');
        break;
      }
    }
  }
  parts.push('--', wrap(content.reason));
  if (content.unsubscribeUrl) parts.push('Unsubscribe from these e-mails:', content.unsubscribeUrl);
  if (content.choicesUrl) parts.push('Your e-mail choices:', content.choicesUrl);
  parts.push('Sent by Lightkeel on behalf of your mission team.');
  return `${parts.join('\n')}\n`;
}
