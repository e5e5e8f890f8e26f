/**
 * Route and page guards. A handler declares the action it needs; the guard finds the session
 * user, their membership of the workspace named in the URL and checks the permission matrix.
 *
 * - no session → 401 (pages: redirect to sign-in)
 * - not a member of the workspace, or an object of another workspace → 404 (never "403, exists")
 * - a member whose role does not allow the action → 403
 */
import type { User, Workspace, Role } from "@/db/schema";
import { getMembership, getWorkspaceBySlug } from "@/db/queries/workspaces";
import { AppError, forbidden, notFound, toErrorBody, unauthenticated } from "@/lib/errors";
import { can, type Action } from "./permissions";
import { userFromRequest } from "./session";
import { assertWritable, isWriteAction } from "@/lib/billing/access";

export interface WorkspaceContext {
  user: User;
  workspace: Workspace;
  role: Role;
}

/**
 * Resolve and authorise a workspace context for a user. Throws AppError (401/404/403).
 * `enforceWritable: false` is for pages: they still render while the workspace is read-only
 * (showing why), and the write itself is refused by its route handler.
 */
export async function authorize(user: User | null, slug: string, action: Action, opts: { enforceWritable?: boolean } = {}): Promise<WorkspaceContext> {
  if (!user) throw unauthenticated();
  const workspace = await getWorkspaceBySlug(slug);
  if (!workspace) throw notFound("That workspace");
  const membership = await getMembership(workspace.id, user.id);
  if (!membership) throw notFound("That workspace");
  if (!can(membership.role, action)) throw forbidden();
  if (opts.enforceWritable !== false && isWriteAction(action)) assertWritable(workspace);
  return { user, workspace, role: membership.role };
}

/** Throws 403 unless the context's role may perform `action` (for a second action in one handler). */
export function requireAction(ctx: WorkspaceContext, action: Action): void {
  if (!can(ctx.role, action)) throw forbidden();
  if (isWriteAction(action)) assertWritable(ctx.workspace);
}

/** JSON error response from anything thrown. */
export function errorResponse(err: unknown): Response {
  const { status, body, headers } = toErrorBody(err);
  return Response.json(body, { status, headers });
}

type RouteContext<P> = { params: Promise<P> };

/** A route handler over a workspace: `export const GET = workspaceRoute("project.view", async ({ ctx }) => …)`. */
export function workspaceRoute<P extends { slug: string }>(
  action: Action,
  handler: (args: { req: Request; params: P; ctx: WorkspaceContext }) => Promise<Response | object>,
) {
  return async (req: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      const params = await context.params;
      const ctx = await authorize(await userFromRequest(req), params.slug, action);
      const out = await handler({ req, params, ctx });
      return out instanceof Response ? out : Response.json(out);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/** A route handler for any signed-in user (no workspace in the URL). */
export function userRoute<P = Record<string, never>>(
  handler: (args: { req: Request; params: P; user: User }) => Promise<Response | object>,
) {
  return async (req: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      const user = await userFromRequest(req);
      if (!user) throw unauthenticated();
      const out = await handler({ req, params: await context.params, user });
      return out instanceof Response ? out : Response.json(out);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/** A public route handler (no session needed): only the error mapping. */
export function publicRoute<P = Record<string, never>>(
  handler: (args: { req: Request; params: P; user: User | null }) => Promise<Response | object>,
) {
  return async (req: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      const out = await handler({ req, params: await context.params, user: await userFromRequest(req) });
      return out instanceof Response ? out : Response.json(out);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

export { AppError };
