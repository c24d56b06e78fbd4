import mjml2html from 'mjml';
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

export async function renderEmail<N extends EmailName>(name: N, data: EmailData[N]): Promise<RenderedEmail>;
export async function renderEmail(name: string, data: Record<string, unknown>): Promise<RenderedEmail>;
export async function renderEmail(name: string, data: unknown): Promise<RenderedEmail> {
  if (!isEmailName(name)) throw new EmailTemplateError(`unknown e-mail template "${name}"`, name);
  const parsed = emailDataSchemas[name].safeParse(data);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => ({ path: i.path.join('.') || '(data)', message: i.message }));
    throw new EmailTemplateError(
      `invalid data for e-mail template "${name}": ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
      name,
      issues,
    );
  }
  const personal = PERSONAL_FIELDS[name];
  if (personal) return renderPersonalised(name, parsed.data, personal);
  return renderParsed(name, parsed.data);
}

// Fields that differ per recipient in otherwise identical mail (a dispatch to 10,000 readers differs only in
// its unsubscribe link). Such mail is rendered once with placeholders, then each copy swaps in its own values:
// mjml takes milliseconds per message, which would otherwise bound how fast a dispatch goes out.
const PERSONAL_FIELDS: Partial<Record<EmailName, readonly string[]>> = { dispatch: ['unsubscribeUrl'] };
const placeholder = (field: string) => `https://personal.invalid/lk-${field}-7f3a`;
const shared = new Map<string, Promise<RenderedEmail>>();
const SHARED_MAX = 16;

async function renderPersonalised(name: EmailName, data: Record<string, unknown>, fields: readonly string[]): Promise<RenderedEmail> {
  const generic = { ...data };
  for (const f of fields) generic[f] = placeholder(f);
  const key = `${name}\u0000${JSON.stringify(generic)}`;
  let pending = shared.get(key);
  if (!pending) {
    pending = renderParsed(name, generic);
    shared.set(key, pending);
    pending.catch(() => shared.delete(key));
    if (shared.size > SHARED_MAX) shared.delete(shared.keys().next().value!);
  }
  let { subject, html, text } = await pending;
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
