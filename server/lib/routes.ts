// Every API route is declared with its access rule here, so guards are never forgotten and the
// authorisation test can walk the full table.
import { Router, type RequestHandler } from 'express';
import { can, type Permission } from '../../src/shared/permissions';
import { AppError } from './app-error';

export type Access = 'public' | 'signedIn' | Permission;
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface RouteInfo {
  method: Method;
  path: string;
  access: Access;
}

export function requireAccess(access: Access): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    if (!req.user) return next(AppError.unauthenticated());
    if (access !== 'signedIn' && !can(req.user.roles, access)) return next(AppError.forbidden());
    next();
  };
}

export class ApiRouter {
  readonly router = Router();
  readonly routes: RouteInfo[] = [];
  constructor(readonly base: string) {}

  private add(method: Method, path: string, access: Access, handlers: RequestHandler[]) {
    this.routes.push({ method, path: this.base + (path === '/' ? '' : path), access });
    this.router[method](path, requireAccess(access), ...handlers);
    return this;
  }
  get(path: string, access: Access, ...h: RequestHandler[]) {
    return this.add('get', path, access, h);
  }
  post(path: string, access: Access, ...h: RequestHandler[]) {
    return this.add('post', path, access, h);
  }
  put(path: string, access: Access, ...h: RequestHandler[]) {
    return this.add('put', path, access, h);
  }
  patch(path: string, access: Access, ...h: RequestHandler[]) {
    return this.add('patch', path, access, h);
  }
  delete(path: string, access: Access, ...h: RequestHandler[]) {
    return this.add('delete', path, access, h);
  }
}
