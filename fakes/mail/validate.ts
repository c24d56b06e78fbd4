// Request validation modelled on the mail service's documented rules: from, to and subject required,
// html or text required, at most 50 addresses in `to`, at most 100 e-mails per batch.

export const MAX_TO_RECIPIENTS = 50;
export const MAX_BATCH_EMAILS = 100;
/** The service's documented limit for one e-mail after base64 decoding (40 MB). */
export const MAX_ATTACHMENTS_BYTES = 40 * 1024 * 1024;
const BASE64 = /^(?:[A-Za-z0-9+/]{4})*(?:[A-Za-z0-9+/]{2}==|[A-Za-z0-9+/]{3}=)?$/;

export class ApiError extends Error {
  constructor(
    readonly statusCode: number,
    readonly errorName: string,
    message: string,
    readonly headers: Record<string, string> = {},
  ) {
    super(message);
  }
  toJSON() {
    return { statusCode: this.statusCode, name: this.errorName, message: this.message };
  }
}

export interface EmailInput {
  from: string;
  to: string[];
  cc: string[] | null;
  bcc: string[] | null;
  reply_to: string[] | null;
  subject: string;
  html: string | null;
  text: string | null;
  headers: Record<string, string>;
  tags: Array<{ name: string; value: string }>;
  scheduled_at: string | null;
  /** As the API takes them: base64 `content` (or a `path` URL the service would fetch), kept whole. */
  attachments: Array<{
    filename: string | null;
    content_type: string | null;
    content_id: string | null;
    path: string | null;
    content: string | null;
    size: number;
  }>;
}

// addr@domain.tld, or "Display Name <addr@domain.tld>".
const BARE = /^[^\s@<>",;]+@[^\s@<>",;]+\.[^\s@<>",;]+$/;
const NAMED = /^[^<>]*<([^\s@<>",;]+@[^\s@<>",;]+\.[^\s@<>",;]+)>$/;

export function isValidAddress(value: string): boolean {
  const v = value.trim();
  return BARE.test(v) || NAMED.test(v);
}

/** The bare address of "Name <a@b.c>" or "a@b.c", lower-cased, for filtering. */
export function bareAddress(value: string): string {
  const v = value.trim();
  const m = NAMED.exec(v);
  return (m?.[1] ?? v).toLowerCase();
}

const FORMAT_HINT = 'The email address needs to follow the `email@example.com` or `Name <email@example.com>` format.';

function missing(field: string): ApiError {
  return new ApiError(422, 'missing_required_field', `Missing \`${field}\` field.`);
}
function invalid(message: string): ApiError {
  return new ApiError(400, 'validation_error', message);
}

function addressList(body: Record<string, unknown>, field: string, required: boolean): string[] | null {
  const raw = body[field];
  if (raw === undefined || raw === null || raw === '') {
    if (required) throw missing(field);
    return null;
  }
  const list = typeof raw === 'string' ? [raw] : raw;
  if (!Array.isArray(list)) throw invalid(`Invalid \`${field}\` field. Expected a string or an array of strings.`);
  if (required && list.length === 0) throw missing(field);
  for (const item of list) {
    if (typeof item !== 'string' || !isValidAddress(item)) {
      throw invalid(`Invalid \`${field}\` field. ${FORMAT_HINT}`);
    }
  }
  return (list as string[]).map((s) => s.trim());
}

function optionalString(body: Record<string, unknown>, field: string): string | null {
  const v = body[field];
  if (v === undefined || v === null) return null;
  if (typeof v !== 'string') throw invalid(`Invalid \`${field}\` field. Expected a string.`);
  return v;
}

const TAG_PART = /^[A-Za-z0-9_-]{1,256}$/;

export function validateEmail(input: unknown, { batch }: { batch: boolean }): EmailInput {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    throw invalid('The request body must be a JSON object.');
  }
  const body = input as Record<string, unknown>;

  const fromRaw = body.from;
  if (fromRaw === undefined || fromRaw === null || fromRaw === '') throw missing('from');
  if (typeof fromRaw !== 'string' || !isValidAddress(fromRaw)) throw invalid(`Invalid \`from\` field. ${FORMAT_HINT}`);

  const to = addressList(body, 'to', true) as string[];
  if (to.length > MAX_TO_RECIPIENTS) {
    throw invalid(`Invalid \`to\` field. Too many recipients: ${to.length}; the maximum is ${MAX_TO_RECIPIENTS}.`);
  }
  const cc = addressList(body, 'cc', false);
  const bcc = addressList(body, 'bcc', false);
  const replyTo = addressList(body, 'reply_to', false);

  const subject = body.subject;
  if (subject === undefined || subject === null || subject === '') throw missing('subject');
  if (typeof subject !== 'string') throw invalid('Invalid `subject` field. Expected a string.');

  const html = optionalString(body, 'html');
  const text = optionalString(body, 'text');
  if (!html && !text && body.template === undefined) throw missing('html` or `text');
  if (body.template !== undefined) throw invalid('Stored templates are not supported by the local mail fake.');

  let headers: Record<string, string> = {};
  if (body.headers !== undefined && body.headers !== null) {
    if (typeof body.headers !== 'object' || Array.isArray(body.headers)) {
      throw invalid('Invalid `headers` field. Expected an object of strings.');
    }
    for (const [k, v] of Object.entries(body.headers)) {
      if (typeof v !== 'string') throw invalid(`Invalid \`headers\` field. Header "${k}" must be a string.`);
    }
    headers = body.headers as Record<string, string>;
  }

  let tags: Array<{ name: string; value: string }> = [];
  if (body.tags !== undefined && body.tags !== null) {
    if (!Array.isArray(body.tags)) throw invalid('Invalid `tags` field. Expected an array of { name, value }.');
    tags = body.tags.map((tag: unknown, i: number) => {
      const t = tag as { name?: unknown; value?: unknown };
      if (typeof t?.name !== 'string' || typeof t?.value !== 'string' || !TAG_PART.test(t.name) || !TAG_PART.test(t.value)) {
        throw invalid(
          `Invalid \`tags[${i}]\` field. Tag names and values may only contain ASCII letters, numbers, underscores or dashes, up to 256 characters.`,
        );
      }
      return { name: t.name, value: t.value };
    });
  }

  const scheduledAt = optionalString(body, 'scheduled_at');
  if (scheduledAt !== null) {
    if (batch) throw invalid('The `scheduled_at` field is not supported in batch sending.');
    if (Number.isNaN(Date.parse(scheduledAt))) {
      throw invalid('Invalid `scheduled_at` field. Use an ISO 8601 date-time, e.g. 2030-01-01T09:00:00Z.');
    }
  }

  let attachments: EmailInput['attachments'] = [];
  if (body.attachments !== undefined && body.attachments !== null) {
    if (batch) throw invalid('The `attachments` field is not supported in batch sending.');
    if (!Array.isArray(body.attachments)) throw invalid('Invalid `attachments` field. Expected an array.');
    attachments = body.attachments.map((a: unknown, i: number) => {
      const att = a as { filename?: unknown; content?: unknown; content_type?: unknown; content_id?: unknown; path?: unknown };
      if (typeof att?.content !== 'string' && typeof att?.path !== 'string') {
        throw invalid('Invalid `attachments` field. Each attachment needs `content` or `path`.');
      }
      // The SDK sends binary content as base64 text; anything else (a JSON-ified Buffer, raw bytes) is refused.
      if (typeof att.content === 'string' && !BASE64.test(att.content.replace(/\s+/g, ''))) {
        throw invalid(`Invalid \`attachments[${i}].content\` field. Expected a base64 string.`);
      }
      const content = typeof att.content === 'string' ? att.content.replace(/\s+/g, '') : null;
      return {
        filename: typeof att.filename === 'string' ? att.filename : null,
        content_type: typeof att.content_type === 'string' ? att.content_type : null,
        content_id: typeof att.content_id === 'string' ? att.content_id : null,
        path: typeof att.path === 'string' ? att.path : null,
        content,
        size: content ? Buffer.byteLength(content, 'base64') : 0,
      };
    });
    const total = attachments.reduce((n, a) => n + a.size, 0);
    if (total > MAX_ATTACHMENTS_BYTES) throw invalid('Attachments exceed the 40 MB limit for one email.');
  }

  return {
    from: fromRaw.trim(),
    to,
    cc,
    bcc,
    reply_to: replyTo,
    subject,
    html,
    text,
    headers,
    tags,
    scheduled_at: scheduledAt ? new Date(scheduledAt).toISOString() : null,
    attachments,
  };
}
