import type { Request, Response, NextFunction, RequestHandler } from 'express';
import type { z } from 'zod';

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
    const input = {
      body: schemas.body ? schemas.body.parse(req.body ?? {}) : undefined,
      query: schemas.query ? schemas.query.parse(req.query) : undefined,
      params: schemas.params ? schemas.params.parse(req.params) : undefined,
    } as Valid<S>;
    await handler(req, res, input, next);
  };
}
