import mjml2html from 'mjml';
import type { ZodType } from 'zod';
import { escapeHtml } from './escape';
import { layoutMjml, layoutText, type EmailContent } from './layout';
import { emailDataSchemas, emailTemplates, type EmailData, type EmailName } from './templates';

export type { EmailData, EmailName } from './templates';
export { emailNames } from './templates';

export interface RenderedEmail {
  subject: string;
  html: string;
  text: string;
}

export class EmailTemplateError extends Error {
  constructor(
    message: string,
    readonly template: string,
    readonly issues: Array<{ path: string; message: string }> = [],
  ) {
    super(message);
    this.name = 'EmailTemplateError';
  }
}

function isEmailName(name: string): name is EmailName {
  return Object.hasOwn(emailDataSchemas, name);
}

/**
 * Data stored once for many copies of a mail (mail_shared): `key` names `data` for good (the row never changes),
 * so copies that carry only their personal fields are matched to an already rendered copy by the key alone.
 */
export type SharedData = { key: string; data: Record<string, unknown> };

export async function renderEmail<N extends EmailName>(name: N, data: EmailData[N]): Promise<RenderedEmail>;
export async function renderEmail(name: string, data: Record<string, unknown>, shared?: SharedData | null): Promise<RenderedEmail>;
export async function renderEmail(name: string, data: unknown, shared?: SharedData | null): Promise<RenderedEmail> {
  if (!isEmailName(name)) throw new EmailTemplateError(`unknown e-mail template "${name}"`, name);
  const personal = PERSONAL_FIELDS[name];
  if (shared) {
    if (!isRecord(data)) throw invalidData(name, [{ path: [], message: 'expected an object' }]);
    const whole = { ...shared.data, ...data };
    // Only the personal fields on top of the shared data: the rendered copy is found by the shared key, without
    // reading the shared data again. Anything else on the row makes it a mail of its own, rendered as a whole.
    if (!personal || !Object.keys(data).every((f) => personal.includes(f))) return renderEmail(name, whole);
    const key = `${name}\u0000#${shared.key}`;
    const copy = copies.get(key);
    if (copy) return personalise(await copy, checkFields(name, whole, personal), personal);
    const parsed = emailDataSchemas[name].safeParse(whole);
    if (!parsed.success) throw invalidData(name, parsed.error.issues);
    return renderPersonalised(name, parsed.data, personal, key);
  }
  if (personal && isRecord(data)) {
    // Another copy of the same mail was checked and rendered already: only this copy's own fields need a check.
    const copy = copies.get(genericKey(name, data, personal));
    if (copy) return personalise(await copy, checkFields(name, data, personal), personal);
  }
  const parsed = emailDataSchemas[name].safeParse(data);
  if (!parsed.success) throw invalidData(name, parsed.error.issues);
  // Keyed by the data as given, so the next copy finds it before parsing (parsing fills defaults in).
  if (personal) return renderPersonalised(name, parsed.data, personal, genericKey(name, data as Record<string, unknown>, personal));
  return renderParsed(name, parsed.data);
}

function invalidData(name: string, zodIssues: ReadonlyArray<{ path: PropertyKey[]; message: string }>): EmailTemplateError {
  const issues = zodIssues.map((i) => ({ path: i.path.map(String).join('.') || '(data)', message: i.message }));
  return new EmailTemplateError(
    `invalid data for e-mail template "${name}": ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
    name,
    issues,
  );
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

// Fields that differ per recipient in otherwise identical mail (a dispatch to 10,000 readers differs only in
// its unsubscribe link). Such mail is rendered once with placeholders, then each copy swaps in its own values:
// mjml takes milliseconds per message, which would otherwise bound how fast a dispatch goes out.
const PERSONAL_FIELDS: Partial<Record<EmailName, readonly string[]>> = { dispatch: ['unsubscribeUrl'] };
const placeholder = (field: string) => `https://personal.invalid/lk-${field}-7f3a`;
// Rendered generic copies, keyed by the template and the data as given (before parsing) with the personal fields
// replaced, or by the template and the shared key: a key is stored only once the whole data, personal fields
// included, passed the template's schema.
const copies = new Map<string, Promise<RenderedEmail>>();
const SHARED_MAX = 16;

const genericKey = (name: EmailName, data: Record<string, unknown>, fields: readonly string[]) => {
  const generic = { ...data };
  for (const f of fields) generic[f] = placeholder(f);
  return `${name}\u0000${JSON.stringify(generic)}`;
};

/** Checks only the personal fields, each against its own schema in the template's (object) schema. */
function checkFields(name: EmailName, data: Record<string, unknown>, fields: readonly string[]): Record<string, unknown> {
  const shape = (emailDataSchemas[name] as unknown as { shape: Record<string, ZodType> }).shape;
  const out: Record<string, unknown> = {};
  for (const f of fields) {
    const parsed = shape[f]!.safeParse(data[f]);
    if (!parsed.success)
      throw invalidData(
        name,
        parsed.error.issues.map((i) => ({ ...i, path: [f, ...i.path] })),
      );
    out[f] = parsed.data;
  }
  return out;
}

async function renderPersonalised(
  name: EmailName,
  data: Record<string, unknown>,
  fields: readonly string[],
  key: string,
): Promise<RenderedEmail> {
  const generic = { ...data };
  for (const f of fields) generic[f] = placeholder(f);
  let pending = copies.get(key);
  if (!pending) {
    pending = renderParsed(name, generic);
    copies.set(key, pending);
    pending.catch(() => copies.delete(key));
    if (copies.size > SHARED_MAX) copies.delete(copies.keys().next().value!);
  }
  return personalise(await pending, data, fields);
}

function personalise(rendered: RenderedEmail, data: Record<string, unknown>, fields: readonly string[]): RenderedEmail {
  let { subject, html, text } = rendered;
  for (const f of fields) {
    const value = String(data[f]);
    html = html.split(placeholder(f)).join(escapeHtml(value));
    text = text.split(placeholder(f)).join(value);
    subject = subject.split(placeholder(f)).join(value);
  }
  return { subject, html, text };
}

async function renderParsed(name: EmailName, data: unknown): Promise<RenderedEmail> {
  // The schema for `name` produced the data, so it fits that template's builder.
  const content = (emailTemplates[name] as (d: unknown) => EmailContent)(data);
  // mjml 5 renders asynchronously; strict validation throws on unknown tags or bad attributes.
  let result: Awaited<ReturnType<typeof mjml2html>>;
  try {
    result = await mjml2html(layoutMjml(content), { validationLevel: 'strict', fonts: {}, keepComments: false });
  } catch (err) {
    throw new EmailTemplateError(`mjml rejected template "${name}": ${(err as Error).message}`, name);
  }
  if (result.errors.length) {
    throw new EmailTemplateError(
      `mjml reported errors in template "${name}": ${result.errors.map((e) => e.formattedMessage).join('; ')}`,
      name,
    );
  }
  return { subject: content.subject, html: result.html, text: layoutText(content) };
}
