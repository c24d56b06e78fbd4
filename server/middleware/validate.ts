import type { Request, Response, NextFunction, RequestHandler } from 'express';
import { z, ZodError } from 'zod';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };
type Out<S> = S extends z.ZodType ? z.output<S> : undefined;
export type Valid<S extends Schemas> = { body: Out<S['body']>; query: Out<S['query']>; params: Out<S['params']> };

/**
 * Parses the request once with the given zod schemas and hands the parsed values to the handler;
 * a ZodError reaches the error middleware, which answers 400 with field paths.
 */
export function validated<S extends Schemas>(
  schemas: S,
  handler: (req: Request, res: Response, input: Valid<S>, next: NextFunction) => unknown,
): RequestHandler {
  return async (req, res, next) => {
    const parts = { params: schemas.params, query: schemas.query, body: schemas.body } as const;
    const input: Record<string, unknown> = {};
    const issues: z.core.$ZodIssue[] = [];
    for (const [key, schema] of Object.entries(parts)) {
      if (!schema) continue;
      const source = key === 'body' ? (req.body ?? {}) : key === 'query' ? req.query : req.params;
      const r = schema.safeParse(source);
      if (r.success) input[key] = r.data;
      else issues.push(...r.error.issues);
    }
    // Every field's problem at once, not only the first part's.
    if (issues.length) throw new ZodError(issues);
    await handler(req, res, input as Valid<S>, next);
  };
}
