// The fake's own hosted pages (card entry for a checkout session, card update for a customer). Plain,
// accessible HTML in a design of our own; no script needed.
import { normaliseCardNumber, testCards, type CardBehaviour } from './cards';
import type { CardInput } from './engine';
import type { ApiObject } from './store';

export function escapeHtml(value: unknown): string {
  return String(value ?? '')
    .replaceAll('&', '&amp;')
    .replaceAll('<', '&lt;')
    .replaceAll('>', '&gt;')
    .replaceAll('"', '&quot;')
    .replaceAll("'", '&#39;');
}

export type FieldErrors = Partial<Record<'email' | 'card_number' | 'expiry' | 'cvc' | 'form', string>>;

export interface CardForm {
  email?: string;
  card_number?: string;
  expiry?: string;
  cvc?: string;
  name?: string;
}

/** Checks the typed card against the test numbers; returns the card or the message for each bad field. */
export function readCardForm(
  form: CardForm,
  nowSeconds: number,
  opts: { emailRequired: boolean },
): { card: CardInput } | { errors: FieldErrors } {
  const errors: FieldErrors = {};
  const email = (form.email ?? '').trim();
  if (opts.emailRequired && !email) errors.email = 'Enter an e-mail address for the receipt.';
  else if (email && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) errors.email = 'That e-mail address does not look complete.';
  const number = normaliseCardNumber(form.card_number ?? '');
  const behaviour: CardBehaviour | undefined = testCards[number];
  if (!number) errors.card_number = 'Enter the card number.';
  else if (!behaviour) errors.card_number = 'That card number is not valid.';
  let expMonth = 0;
  let expYear = 0;
  const m = (form.expiry ?? '').trim().match(/^(\d{1,2})\s*\/\s*(\d{2}|\d{4})$/);
  if (!m) errors.expiry = 'Enter the expiry date as MM / YY.';
  else {
    expMonth = Number(m[1]);
    expYear = m[2]!.length === 2 ? 2000 + Number(m[2]) : Number(m[2]);
    const now = new Date(nowSeconds * 1000);
    if (expMonth < 1 || expMonth > 12) errors.expiry = 'The month must be between 01 and 12.';
    else if (expYear * 12 + expMonth < now.getUTCFullYear() * 12 + now.getUTCMonth() + 1) errors.expiry = 'This card has expired.';
  }
  if (!/^\d{3,4}$/.test((form.cvc ?? '').trim())) errors.cvc = 'Enter the 3 or 4 digit security code.';
  if (Object.keys(errors).length > 0 || !behaviour) return { errors };
  const name = (form.name ?? '').trim();
  return { card: { behaviour, last4: number.slice(-4), expMonth, expYear, ...(name ? { name } : {}), ...(email ? { email } : {}) } };
}

const styles = `
:root { --ink:#1f2a2e; --paper:#f5f2ec; --card:#ffffff; --line:#c9c2b4; --accent:#2f5d50; --accent-ink:#ffffff; --bad:#9b2f1f; --muted:#5b6468; }
* { box-sizing: border-box; }
body { margin:0; font: 16px/1.5 system-ui, sans-serif; color:var(--ink); background:var(--paper); }
main { max-width: 30rem; margin: 2rem auto; padding: 0 1rem; }
.sheet { background:var(--card); border:1px solid var(--line); border-radius:6px; padding:1.5rem; }
.badge { display:inline-block; font-size:.8rem; letter-spacing:.05em; padding:.1rem .5rem; border:1px dashed var(--accent); color:var(--accent); border-radius:3px; }
h1 { font-size:1.35rem; margin:.6rem 0 1rem; }
table { width:100%; border-collapse:collapse; margin-bottom:1rem; }
td { padding:.3rem 0; border-bottom:1px solid var(--line); } td.amount { text-align:right; white-space:nowrap; }
tr.total td { font-weight:700; border-bottom:none; }
label { display:block; font-weight:600; margin-top:.9rem; }
input { width:100%; font:inherit; padding:.55rem .6rem; border:1px solid var(--line); border-radius:4px; background:#fff; }
input:focus { outline:3px solid #e0b04a; outline-offset:1px; }
input[aria-invalid="true"] { border-color:var(--bad); }
.row { display:flex; gap:.8rem; } .row > div { flex:1; }
.field-error { color:var(--bad); font-size:.9rem; margin:.2rem 0 0; }
.alert { border-left:4px solid var(--bad); background:#fbeeea; padding:.6rem .8rem; margin-bottom:1rem; }
.ok { border-left:4px solid var(--accent); background:#e9f2ee; padding:.6rem .8rem; margin-bottom:1rem; }
button { margin-top:1.3rem; width:100%; font:inherit; font-weight:700; padding:.7rem; border:0; border-radius:4px; background:var(--accent); color:var(--accent-ink); cursor:pointer; }
button:focus { outline:3px solid #e0b04a; outline-offset:2px; }
.muted { color:var(--muted); font-size:.9rem; }
.paying-for { margin:-.4rem 0 1rem; }
a { color:var(--accent); }
details { margin-top:1.2rem; } code { font-size:.9rem; }
`;

export function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${styles}</style>
</head>
<body>
<main>
<div class="sheet">
<span class="badge">Local test processor</span>
${body}
</div>
</main>
</body>
</html>`;
}

function field(name: keyof CardForm, label: string, value: string, errors: FieldErrors, attrs: string): string {
  const err = errors[name as keyof FieldErrors];
  const errId = `${name}-error`;
  return `<label for="${name}">${escapeHtml(label)}</label>
<input id="${name}" name="${name}" value="${escapeHtml(value)}" ${attrs}${err ? ` aria-invalid="true" aria-describedby="${errId}"` : ''}>
${err ? `<p class="field-error" id="${errId}">${escapeHtml(err)}</p>` : ''}`;
}

function cardFields(form: CardForm, errors: FieldErrors): string {
  return `${field('card_number', 'Card number', form.card_number ?? '', errors, 'inputmode="numeric" autocomplete="cc-number" required')}
<div class="row">
<div>${field('expiry', 'Expiry (MM / YY)', form.expiry ?? '', errors, 'autocomplete="cc-exp" placeholder="MM / YY" required')}</div>
<div>${field('cvc', 'Security code', form.cvc ?? '', errors, 'inputmode="numeric" autocomplete="cc-csc" required')}</div>
</div>
${field('name', 'Name on card', form.name ?? '', errors, 'autocomplete="cc-name"')}`;
}

const testNumbersHelp = `<details><summary>Test card numbers</summary>
<ul class="muted">
<li><code>4242 4242 4242 4242</code> is approved</li>
<li><code>4000 0000 0000 0002</code> is declined</li>
<li><code>4000 0000 0000 9995</code> is declined for lack of funds</li>
<li><code>4000 0000 0000 0259</code> is approved, then disputed</li>
<li><code>4000 0000 0000 0341</code> can be saved, but charges on it are declined</li>
</ul>
<p class="muted">Any future expiry date and any 3 digits work.</p>
</details>`;

function alert(errors: FieldErrors): string {
  if (errors.form) return `<div class="alert" role="alert">${escapeHtml(errors.form)}</div>`;
  const count = Object.keys(errors).length;
  if (count === 0) return '';
  return `<div class="alert" role="alert">Please correct ${count === 1 ? 'the field' : `the ${count} fields`} marked below.</div>`;
}

/** An amount in the currency's own sign where it has one ("$12.00", "€8.00"), else its code. */
export function formatMinor(amountMinor: number, currency: string): string {
  const code = currency.toUpperCase();
  try {
    const format = new Intl.NumberFormat('en-US', { style: 'currency', currency: code });
    const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
    return format.format(amountMinor / 10 ** digits);
  } catch {
    // unknown currency code: show two decimals after the code
    return `${code} ${(amountMinor / 100).toFixed(2)}`;
  }
}

function cadence(recurring: { interval: string; interval_count: number }): string {
  return recurring.interval_count === 1 ? `every ${recurring.interval}` : `every ${recurring.interval_count} ${recurring.interval}s`;
}

/**
 * The card page of a checkout session, in plain words of our own: what is being paid for (the caller's
 * description, e.g. the campaign and the reward tier), what is taken now, and for a recurring price what
 * follows ("Pay $12.00 now, then every month").
 */
export function checkoutPage(
  session: ApiObject,
  lineItems: ApiObject[],
  form: CardForm,
  errors: FieldErrors,
  description: string | null = null,
): string {
  const recurring = lineItems.find((li) => li.price.type === 'recurring')?.price.recurring;
  const every = recurring ? cadence(recurring) : '';
  const rows = lineItems
    .map(
      (li) =>
        `<tr><td>${escapeHtml(li.description ?? 'Item')}${li.quantity > 1 ? ` × ${li.quantity}` : ''}${li.price.type === 'recurring' ? ` <span class="muted">(${every})</span>` : ''}</td><td class="amount">${formatMinor(li.amount_total, li.currency)}</td></tr>`,
    )
    .join('\n');
  const total = formatMinor(session.amount_total, session.currency);
  const askEmail = !session.customer && !session.customer_email;
  const action = recurring ? `Pay ${total} now, then ${every}` : `Pay ${total}`;
  return page(
    'Pay by card',
    `<h1>${recurring ? 'Pay by card, then regularly' : 'Pay by card'}</h1>
${description ? `<p class="paying-for">Paying for <strong>${escapeHtml(description)}</strong></p>` : ''}
<table aria-label="What you pay"><tbody>
${rows}
<tr class="total"><td>Taken now</td><td class="amount">${total}</td></tr>
</tbody></table>
${recurring ? `<p class="muted">After today, ${total} is taken ${every} on the same day until you stop it.</p>` : ''}
${session.customer_email ? `<p class="muted">Receipt to ${escapeHtml(session.customer_email)}</p>` : ''}
${alert(errors)}
<form method="post" action="/pay/${escapeHtml(session.id)}" novalidate>
${askEmail ? field('email', 'E-mail', form.email ?? '', errors, `type="email" autocomplete="email"${session.mode === 'subscription' ? ' required' : ''}`) : ''}
${cardFields(form, errors)}
<button type="submit">${escapeHtml(action)}</button>
</form>
${session.cancel_url ? `<p><a href="${escapeHtml(session.cancel_url)}" id="cancel-link">Cancel and go back</a></p>` : ''}
${testNumbersHelp}`,
  );
}

export function messagePage(title: string, message: string, link?: { href: string; text: string }): string {
  return page(
    title,
    `<h1>${escapeHtml(title)}</h1><p>${escapeHtml(message)}</p>${link ? `<p><a href="${escapeHtml(link.href)}">${escapeHtml(link.text)}</a></p>` : ''}`,
  );
}

export function portalPage(
  portal: ApiObject,
  customer: ApiObject,
  current: ApiObject | undefined,
  openInvoices: ApiObject[],
  form: CardForm,
  errors: FieldErrors,
  notice?: string,
): string {
  const due = openInvoices
    .map(
      (inv) =>
        `<li>${formatMinor(inv.amount_remaining, inv.currency)} due since ${new Date(inv.created * 1000).toISOString().slice(0, 10)}</li>`,
    )
    .join('');
  return page(
    'Update your card',
    `<h1>Update your card</h1>
<p>${customer.email ? `For ${escapeHtml(customer.email)}. ` : ''}${current ? `Card on file ends in <strong>${escapeHtml(current.card.last4)}</strong>, expires ${String(current.card.exp_month).padStart(2, '0')}/${String(current.card.exp_year).slice(-2)}.` : 'No card on file.'}</p>
${due ? `<div class="alert"><p>Unpaid:</p><ul>${due}</ul><p>Saving a new card tries these again straight away.</p></div>` : ''}
${notice ? `<div class="ok" role="status">${escapeHtml(notice)}</div>` : ''}
${alert(errors)}
<form method="post" action="/billing/${escapeHtml(portal.id)}" novalidate>
${cardFields(form, errors)}
<button type="submit">Save card</button>
</form>
${portal.return_url ? `<p><a href="${escapeHtml(portal.return_url)}">Back without changes</a></p>` : ''}
${testNumbersHelp}`,
  );
}
