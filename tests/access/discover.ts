import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

// Finds the app's entry points from the files themselves, so nothing has to be listed by hand:
// every app/**/route.ts with the HTTP methods it exports, and every "use server" module under app/
// with the functions it exports.

export const ROOT = fileURLToPath(new URL("../..", import.meta.url));
const APP = path.join(ROOT, "app");

export const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;
export type HttpMethod = (typeof HTTP_METHODS)[number];

type Handler = (
  req: Request,
  ctx: { params: Promise<Record<string, unknown>> },
) => Promise<Response>;

export interface DiscoveredRoute {
  /** The URL pattern as Next serves it: `/api/jobs/[id]/cards`. */
  pattern: string;
  /** The file, relative to the project: `app/api/jobs/[id]/cards/route.ts`. */
  file: string;
  source: string;
  handlers: Partial<Record<HttpMethod, Handler>>;
}

export interface DiscoveredEndpoint {
  /** `GET /api/jobs/[id]`, the key of the access rules. */
  key: string;
  method: HttpMethod;
  route: DiscoveredRoute;
  handler: Handler;
  /** The part of the file that defines this method's handler. */
  body: string;
}

export interface DiscoveredAction {
  /** `app/(shop)/users/actions.ts#createUserAction`, the key of the action rules. */
  key: string;
  file: string;
  name: string;
  fn: (...args: unknown[]) => Promise<unknown>;
}

function filesUnder(dir: string): string[] {
  return readdirSync(dir, { recursive: true, encoding: "utf8" })
    .map((f) => path.join(dir, f))
    .sort();
}

function relative(file: string): string {
  return path.relative(ROOT, file).split(path.sep).join("/");
}

/** `app/(shop)/api/x/[id]/route.ts` → `/api/x/[id]`: route groups are not part of the URL. */
function patternOf(file: string): string {
  const segments = path
    .relative(APP, path.dirname(file))
    .split(path.sep)
    .filter((s) => s !== "" && !/^\(.*\)$/.test(s));
  return `/${segments.join("/")}`;
}

/** One method of a route handler file, found from its source text alone (nothing imported). */
export interface RouteMethod {
  key: string;
  method: HttpMethod;
  pattern: string;
  file: string;
}

/**
 * The route methods from the files' text, for a process that cannot load the app's modules (a
 * suite against a running server): `export const GET =`, `export async function GET`,
 * `export { handler as GET }`. access-matrix.test.ts checks it finds what importing finds.
 */
export function discoverRouteMethods(): RouteMethod[] {
  const found: RouteMethod[] = [];
  for (const file of filesUnder(APP).filter((f) => /[/\\]route\.(ts|tsx|js)$/.test(f))) {
    const source = readFileSync(file, "utf8");
    const exported = new Set<string>();
    for (const m of source.matchAll(
      /export\s+(?:const\s+([A-Z]+)\s*=|(?:async\s+)?function\s+([A-Z]+)\b)/g,
    ))
      exported.add((m[1] ?? m[2])!);
    for (const m of source.matchAll(/export\s*\{([^}]*)\}/g))
      for (const name of m[1]!.split(","))
        exported.add(
          name
            .trim()
            .split(/\s+as\s+/)
            .pop()!
            .trim(),
        );
    const pattern = patternOf(file);
    for (const method of HTTP_METHODS.filter((m) => exported.has(m)))
      found.push({ key: `${method} ${pattern}`, method, pattern, file: relative(file) });
  }
  return found;
}

export async function discoverRoutes(): Promise<DiscoveredRoute[]> {
  const routes: DiscoveredRoute[] = [];
  for (const file of filesUnder(APP).filter((f) => /[/\\]route\.(ts|tsx|js)$/.test(f))) {
    const mod = (await import(/* @vite-ignore */ file)) as Record<string, unknown>;
    const handlers: DiscoveredRoute["handlers"] = {};
    for (const method of HTTP_METHODS) {
      const h = mod[method];
      if (typeof h === "function") handlers[method] = h as Handler;
    }
    routes.push({
      pattern: patternOf(file),
      file: relative(file),
      source: readFileSync(file, "utf8"),
      handlers,
    });
  }
  return routes;
}

/**
 * The source of one method's handler: from its `export const GET =` / `export function GET` /
 * `export { handler as GET }` up to the next export.
 */
export function methodBody(source: string, method: HttpMethod): string {
  const start = new RegExp(
    `export\\s+(?:const\\s+${method}\\s*=|(?:async\\s+)?function\\s+${method}\\b)`,
  ).exec(source);
  if (!start) return source; // re-exported (`export { handler as GET }`): the whole file
  const rest = source.slice(start.index + 1);
  const next = rest.search(/\nexport\s/);
  return next === -1 ? rest : rest.slice(0, next);
}

export function endpointsOf(routes: DiscoveredRoute[]): DiscoveredEndpoint[] {
  return routes.flatMap((route) =>
    HTTP_METHODS.filter((m) => route.handlers[m]).map((method) => ({
      key: `${method} ${route.pattern}`,
      method,
      route,
      handler: route.handlers[method]!,
      body: methodBody(route.source, method),
    })),
  );
}

/** True when the module's first statement is the "use server" directive (comments aside). */
export function startsWithUseServer(source: string): boolean {
  const code = source.replace(/^\uFEFF/, "").replace(/^(?:\s+|\/\/[^\n]*\n|\/\*[\s\S]*?\*\/)*/, "");
  return /^(["'])use server\1/.test(code);
}

export async function discoverActions(): Promise<DiscoveredAction[]> {
  const actions: DiscoveredAction[] = [];
  for (const file of filesUnder(APP).filter((f) => /\.(ts|tsx|js)$/.test(f))) {
    if (!startsWithUseServer(readFileSync(file, "utf8"))) continue;
    const mod = (await import(/* @vite-ignore */ file)) as Record<string, unknown>;
    for (const [name, value] of Object.entries(mod)) {
      if (typeof value !== "function") continue;
      actions.push({
        key: `${relative(file)}#${name}`,
        file: relative(file),
        name,
        fn: value as DiscoveredAction["fn"],
      });
    }
  }
  return actions;
}

/** The names in a path pattern: `/api/jobs/[id]/cards/[revision]` → `["id", "revision"]`. */
export function paramNames(pattern: string): { name: string; catchAll: boolean }[] {
  return [...pattern.matchAll(/\[(\.\.\.)?([^\]]+)\]/g)].map((m) => ({
    name: m[2]!,
    catchAll: m[1] !== undefined,
  }));
}
