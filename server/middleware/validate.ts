import type { Request, Response, NextFunction, RequestHandler } from 'express';
import { z, ZodError } from 'zod';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType; file?: z.ZodType };
type Out<S> = S extends z.ZodType ? z.output<S> : undefined;
export type Valid<S extends Schemas> = { body: Out<S['body']>; query: Out<S['query']>; params: Out<S['params']>; file: Out<S['file']> };

type Part = keyof Schemas;
const partWords: Record<Part, string> = {
  body: 'The request body',
  query: 'The query string',
  params: 'The address',
  file: 'The uploaded file',
};

/** What a part of the request was instead of an object, in words. */
function received(value: unknown) {
  if (Array.isArray(value)) return 'a list (JSON array)';
  if (value === null) return 'null';
  return typeof value === 'string' ? 'text' : typeof value;
}

/**
 * Issues of one part, with the part as the first path segment ("body.title", "query.q", "params.id"), so a
 * client can tell a field of its form from a bad address; a whole part of the wrong shape is said in words.
 */
function issuesOf(part: Part, source: unknown, error: ZodError): z.core.$ZodIssue[] {
  return error.issues.map((issue) => {
    if (issue.path.length === 0 && issue.code === 'invalid_type' && issue.expected === 'object') {
      return { ...issue, path: [part], message: `${partWords[part]} must be a JSON object with named fields, not ${received(source)}` };
    }
    return { ...issue, path: [part, ...issue.path] };
  });
}

/**
 * Parses the request once with the given zod schemas and hands the parsed values to the handler;
 * a ZodError reaches the error middleware, which answers 400 with field paths.
 * `file` validates the uploaded file's metadata ({ name }) when multer has run before.
 */
export function validated<S extends Schemas>(
  schemas: S,
  handler: (req: Request, res: Response, input: Valid<S>, next: NextFunction) => unknown,
): RequestHandler {
  return async (req, res, next) => {
    const parts = { params: schemas.params, query: schemas.query, body: schemas.body, file: schemas.file } as const;
    const input: Record<string, unknown> = {};
    const issues: z.core.$ZodIssue[] = [];
    for (const [key, schema] of Object.entries(parts) as [Part, z.ZodType | undefined][]) {
      if (!schema) continue;
      const source =
        key === 'body'
          ? (req.body ?? {})
          : key === 'query'
            ? req.query
            : key === 'params'
              ? req.params
              : req.file
                ? { name: req.file.originalname }
                : undefined;
      const r = schema.safeParse(source);
      if (r.success) input[key] = r.data;
      else issues.push(...issuesOf(key, source, r.error));
    }
    // Every field's problem at once, not only the first part's.
    if (issues.length) throw new ZodError(issues);
    await handler(req, res, input as Valid<S>, next);
  };
}
