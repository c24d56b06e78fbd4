import type { StoredMessage } from './server';

function esc(value: string): string {
  return value.replace(/[&<>"']/g, (ch) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[ch] ?? ch);
}

const STYLE = `
:root{--night:#0b1431;--night-soft:#1c2a55;--silver:#d9dee6;--silver-deep:#5d6778;--amber:#f5a21b;--paper:#fff}
*{box-sizing:border-box}
body{margin:0;font-family:'Nunito Sans','Segoe UI',Helvetica,Arial,sans-serif;background:#eef1f5;color:var(--night);line-height:1.5}
a{color:var(--night-soft)}
a:focus-visible,button:focus-visible{outline:3px solid var(--amber);outline-offset:2px}
.skip{position:absolute;left:-999px}.skip:focus{left:1rem;top:1rem;background:var(--amber);color:var(--night);padding:.5rem 1rem;z-index:2}
header{background:var(--night);color:var(--silver);padding:1rem 1.5rem;border-bottom:4px solid var(--amber);display:flex;gap:1rem;align-items:baseline;flex-wrap:wrap}
header .mark{font-weight:700;font-size:1.4rem;letter-spacing:.05em;color:var(--silver);text-decoration:none}
header .what{color:var(--amber);font-weight:700}
main{max-width:72rem;margin:1.5rem auto;padding:0 1rem}
h1{font-size:1.5rem;margin:0 0 1rem}
.card{background:var(--paper);border:1px solid var(--silver);border-radius:8px;padding:1rem 1.25rem;margin-bottom:1rem}
table{width:100%;border-collapse:collapse}
caption{text-align:left;color:var(--silver-deep);padding-bottom:.5rem}
th,td{text-align:left;padding:.55rem .6rem;border-bottom:1px solid var(--silver);vertical-align:top}
thead th{background:var(--night);color:var(--silver);font-weight:700}
tbody tr:hover{background:#f7f8fb}
dl{display:grid;grid-template-columns:max-content 1fr;gap:.35rem 1rem;margin:0}
dt{color:var(--silver-deep);font-weight:700}
dd{margin:0;word-break:break-word}
iframe{width:100%;min-height:46rem;resize:vertical;border:1px solid var(--silver);border-radius:6px;background:#fff}
pre{white-space:pre-wrap;word-break:break-word;background:#f7f8fb;border:1px solid var(--silver);border-radius:6px;padding:1rem;margin:0}
.badge{display:inline-block;background:var(--amber);color:var(--night);border-radius:999px;padding:0 .6rem;font-size:.85rem;font-weight:700}
.empty{color:var(--silver-deep)}
`;

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)} · Lightkeel outbox</title>
<style>${STYLE}</style>
</head>
<body>
<a class="skip" href="#main">Skip to content</a>
<header><a class="mark" href="/outbox">Lightkeel</a><span class="what">Local outbox</span><span>Mail accepted by the local mail fake; nothing here leaves this machine.</span></header>
<main id="main">
${body}
</main>
</body>
</html>`;
}

function time(iso: string): string {
  return `<time datetime="${esc(iso)}">${esc(iso.replace('T', ' ').replace(/\.\d+Z$/, ' UTC'))}</time>`;
}

export function renderOutboxList(messages: StoredMessage[]): string {
  const rows = messages
    .map(
      (m) => `<tr>
<td>${time(m.created_at)}</td>
<td>${esc(m.to.join(', '))}</td>
<td>${esc(m.from)}</td>
<td><a href="/outbox/${esc(m.id)}">${esc(m.subject)}</a>${m.last_event === 'scheduled' ? ' <span class="badge">scheduled</span>' : ''}</td>
</tr>`,
    )
    .join('\n');
  const table = messages.length
    ? `<table>
<caption>${messages.length} message${messages.length === 1 ? '' : 's'}, newest first</caption>
<thead><tr><th scope="col">Received</th><th scope="col">To</th><th scope="col">From</th><th scope="col">Subject</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>`
    : '<p class="empty">No messages yet. Mail the app sends through the local mail fake appears here.</p>';
  return page('Outbox', `<h1>Outbox</h1>\n<div class="card">${table}</div>\n<p><a href="/outbox">Refresh</a></p>`);
}

export function renderOutboxMessage(m: StoredMessage): string {
  const fields: Array<[string, string | null]> = [
    ['From', m.from],
    ['To', m.to.join(', ')],
    ['Cc', m.cc?.join(', ') ?? null],
    ['Bcc', m.bcc?.join(', ') ?? null],
    ['Reply-To', m.reply_to?.join(', ') ?? null],
    ['Subject', m.subject],
    ['Id', m.id],
    ['Status', m.last_event],
    ['Scheduled for', m.scheduled_at],
    ['Tags', m.tags.length ? m.tags.map((t) => `${t.name}=${t.value}`).join(', ') : null],
    ['Attachments', m.attachments.length ? m.attachments.map((a) => `${a.filename ?? '(unnamed)'} (${a.size} bytes)`).join(', ') : null],
    ...Object.entries(m.headers).map(([k, v]) => [k, v] as [string, string]),
  ];
  const dl = fields
    .filter(([, v]) => v !== null && v !== '')
    .map(([k, v]) => `<dt>${esc(k)}</dt><dd>${esc(v as string)}</dd>`)
    .join('\n');
  const html = m.html
    ? `<iframe src="/outbox/${esc(m.id)}/html" sandbox="" referrerpolicy="no-referrer" title="HTML part of “${esc(m.subject)}”"></iframe>`
    : '<p class="empty">This message has no HTML part.</p>';
  const text = m.text ? `<pre>${esc(m.text)}</pre>` : '<p class="empty">This message has no text part.</p>';
  const files = m.attachments
    .map((a, i) =>
      a.content
        ? `<li><a href="/outbox/${esc(m.id)}/attachments/${i}">${esc(a.filename ?? '(unnamed)')}</a> (${esc(a.content_type ?? 'no type')}, ${a.size} bytes)</li>`
        : `<li>${esc(a.filename ?? '(unnamed)')} (from ${esc(a.path ?? '')})</li>`,
    )
    .join('');
  const attachments = files
    ? `<section class="card" aria-labelledby="h-files"><h2 id="h-files">Attachments</h2><ul>${files}</ul></section>`
    : '';
  return page(
    m.subject,
    `<p><a href="/outbox">← All messages</a></p>
<h1>${esc(m.subject)}</h1>
<section class="card" aria-labelledby="h-headers"><h2 id="h-headers">Headers</h2><dl>
<dt>Received</dt><dd>${time(m.created_at)}</dd>
${dl}
</dl></section>
<section class="card" aria-labelledby="h-html"><h2 id="h-html">HTML part</h2>${html}</section>
<section class="card" aria-labelledby="h-text"><h2 id="h-text">Text part</h2>${text}</section>
${attachments}`,
  );
}

export function renderNotFound(id: string): string {
  return page(
    'Not found',
    `<h1>No such message</h1><p>The outbox holds no message with id <code>${esc(id)}</code>.</p><p><a href="/outbox">← All messages</a></p>`,
  );
}
