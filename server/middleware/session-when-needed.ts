import { Router, type RequestHandler } from 'express';

/**
 * Runs `middleware` (the session, and the signed-in user read from it) only for requests that have or may start a
 * session. A signed-out read — GET or HEAD without the session cookie, outside /api/auth (where the CSRF token,
 * the OAuth state and the return path start a session) — has no session to load and starts none, yet
 * express-session would build, hash and throw away a fresh one for each such request. Those requests go on with
 * no `req.session` and no `req.user`, as the signed-out visitor they are.
 */
export function sessionWhenNeeded(cookieName: string, middleware: RequestHandler[]): RequestHandler {
  const cookiePrefix = `${cookieName}=`;
  const chain = Router();
  for (const mw of middleware) chain.use(mw);
  return (req, res, next) => {
    const method = req.method;
    const cookie = req.headers.cookie;
    const needed =
      (method !== 'GET' && method !== 'HEAD') ||
      req.path.startsWith('/api/auth') ||
      (cookie !== undefined && cookie.includes(cookiePrefix));
    if (needed) chain(req, res, next);
    else next();
  };
}
