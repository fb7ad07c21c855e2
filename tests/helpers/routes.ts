// Every API route as Express holds it: walked from the router stack, so a route a colleague adds
// shows up here without anyone keeping a list. Each route tells what guards it: sign-in
// (`authenticate`) and the permission its `allow(...)` names.
import type { Router } from 'express';
import { apiRouter } from '../../server/routes';
import { authenticate } from '../../server/auth/authenticate';
import type { Permission } from '../../shared/policies';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export type ApiRoute = {
  method: Method;
  /** The path as mounted, e.g. /api/lots/:id. */
  path: string;
  signIn: boolean;
  permission: Permission | null;
};

type Handler = ((...args: never[]) => unknown) & { permission?: Permission };
type Layer = {
  rawPath?: string | RegExp;
  handle: Handler & { stack?: Layer[] };
  route?: { path: string | RegExp; methods: Record<string, boolean>; stack: { handle: Handler }[] };
};

function pathOf(prefix: string, path: string | RegExp | undefined) {
  if (typeof path !== 'string') throw new Error(`The route walker understands string paths only; found ${String(path)} under ${prefix}`);
  return `${prefix}${path === '/' ? '' : path}`;
}

function walk(stack: Layer[], prefix: string, routes: ApiRoute[]) {
  for (const layer of stack) {
    if (layer.route) {
      const handlers = layer.route.stack.map((s) => s.handle);
      const permission = handlers.find((h) => h.permission)?.permission ?? null;
      for (const method of Object.keys(layer.route.methods) as Method[]) {
        routes.push({ method, path: pathOf(prefix, layer.route.path) || '/', signIn: handlers.includes(authenticate as Handler), permission });
      }
    } else if (layer.handle.stack) {
      walk(layer.handle.stack, pathOf(prefix, layer.rawPath), routes);
    }
  }
  return routes;
}

export const apiRoutes = (router: Router = apiRouter): ApiRoute[] => walk((router as unknown as { stack: Layer[] }).stack, '/api', []);

export const routeName = (route: Pick<ApiRoute, 'method' | 'path'>) => `${route.method.toUpperCase()} ${route.path}`;

/** A concrete URL for a route: every parameter names a record that does not exist. */
export const urlOf = (path: string, value = '999999') => path.replace(/:(\w+)/g, (_, name: string) => (/id$/i.test(name) ? value : `no-such-${name}`));
