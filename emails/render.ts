import mjml2html from 'mjml';
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
  // The schema for `name` produced parsed.data, so it fits that template's builder.
  const content = (emailTemplates[name] as (d: unknown) => EmailContent)(parsed.data);
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
