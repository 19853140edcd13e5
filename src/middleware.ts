/**
 * Request pipeline: prepare the database once, resolve the session for every request, then guard
 * pages (redirect to sign-in) and API routes (JSON 401/404/405, same-origin writes); large JSON
 * answers leave compressed.
 */
import { defineMiddleware, sequence } from 'astro:middleware';
import { endpointAction, endpointActions, pageActions, permissionTable } from '@/lib/permissions';
import { serverReady } from '@/lib/server/startup';
import { validateSessionCookie } from '@/lib/server/auth/session';
import { ApiError, methodNotAllowed, notFound, unauthenticated } from '@/lib/server/api/errors';
import { errorResponse } from '@/lib/server/api/respond';
import { compressJson } from '@/lib/server/api/compress';

const compression = defineMiddleware(async (context, next) => {
  const response = await next();
  return context.isPrerendered ? response : compressJson(context.request, response);
});

const ready = defineMiddleware(async (context, next) => {
  if (!context.isPrerendered) await serverReady();
  return next();
});

const session = defineMiddleware(async (context, next) => {
  context.locals.user = null;
  context.locals.session = null;
  if (context.isPrerendered) return next();
  try {
    const { user, session } = await validateSessionCookie(context.cookies);
    context.locals.user = user;
    context.locals.session = session;
  } catch (error) {
    // A database failure is a server error, not a reason to treat the visitor as signed out.
    return errorResponse(error);
  }
  return next();
});

function isApi(pathname: string): boolean {
  return pathname === '/api' || pathname.startsWith('/api/');
}

const writeMethods = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

const apiGuard = defineMiddleware((context, next) => {
  const { pathname } = context.url;
  if (!isApi(pathname)) return next();
  const methods = (endpointActions as Record<string, Record<string, string>>)[context.routePattern];
  if (!methods) return errorResponse(notFound('API route'));
  const action = endpointAction(context.routePattern, context.request.method);
  if (!action) return errorResponse(methodNotAllowed(Object.keys(methods)));
  // Astro's own origin check covers form posts only; JSON writes are checked here.
  const origin = context.request.headers.get('origin');
  if (writeMethods.has(context.request.method) && origin !== null && !sameHost(origin, context.url)) {
    return errorResponse(new ApiError(403, 'cross_origin', 'Cross-site requests are not accepted.'));
  }
  if (permissionTable[action].audience !== 'public' && !context.locals.user) return errorResponse(unauthenticated());
  return next();
});

function sameHost(origin: string, url: URL): boolean {
  try {
    return new URL(origin).host === url.host;
  } catch {
    return false;
  }
}

function isPublicPage(routePattern: string): boolean {
  return pageActions[routePattern] === 'public';
}

const pageGuard = defineMiddleware((context, next) => {
  const { pathname, search } = context.url;
  if (isApi(pathname) || context.isPrerendered || context.locals.user) return next();
  if (isPublicPage(context.routePattern)) return next();
  const target = `/sign-in?next=${encodeURIComponent(pathname + search)}`;
  return context.redirect(target, 302);
});

export const onRequest = sequence(compression, ready, session, apiGuard, pageGuard);
