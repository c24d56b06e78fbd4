import type { RequestHandler } from 'express';
import type { Role } from '../../shared/schemas/auth';
import { forbidden, unauthorized } from '../errors';

export const requireAuth: RequestHandler = (req, _res, next) => {
  if (!req.user) throw unauthorized();
  next();
};

/** Passes when the signed-in account holds any of the roles. */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) throw unauthorized();
    if (!req.user.roles.some((r) => roles.includes(r))) {
      throw forbidden('auth.forbidden', `This needs one of these roles: ${roles.join(', ')}.`);
    }
    next();
  };
}
