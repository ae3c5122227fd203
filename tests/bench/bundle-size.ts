/**
 * The JavaScript the Bench page adds beyond the shell, gzipped (issue 3 acceptance: under
 * 60 KB). Read from React Router's browser manifest in the build
 * (build/client/assets/manifest-<version>.js, `window.__reactRouterManifest = {...}`), which
 * lists for each route its module and the chunks it imports statically — what the browser
 * loads when it navigates there, whatever the page happens to import.
 *
 *   shell  = the client entry + the route modules above the Bench section (root, the
 *            signed-in shell layout) and their imports — loaded on every signed-in page;
 *   bench  = the modules of the routes/bench/* routes on the /bench match and their imports,
 *            minus the shell;
 *   lazy   = chunks those files load later with import() (found in their text), and what
 *            those import — counted too, since the page can fetch them.
 *
 * Sizes are gzip at zlib's default level 6, what the server's compression middleware sends.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { gzipSync } from "node:zlib";

export const BENCH_ROUTE_ID = "routes/bench/index";
export const BUNDLE_TARGET_KB = 60;

type ManifestRoute = { id: string; parentId?: string; module: string; imports?: string[]; css?: string[] };
type BrowserManifest = { entry: { module: string; imports: string[] }; routes: Record<string, ManifestRoute>; version: string };

export type ChunkSize = { file: string; bytes: number; gzipBytes: number; kind: "route" | "lazy" };

export type BundleFigure = {
  routeId: string;
  manifest: string;
  /** Route ids on the /bench match, root first. */
  routeChain: string[];
  files: ChunkSize[];
  jsGzipKB: number;
  jsRawKB: number;
  lazyGzipKB: number;
  cssGzipKB: number;
  shellJsGzipKB: number;
  targetKB: number;
  meetsTarget: boolean;
};

export function readBrowserManifest(clientDir: string): { manifest: BrowserManifest; file: string } {
  const assets = path.join(clientDir, "assets");
  const candidates = readdirSync(assets)
    .filter((f) => /^manifest-[\w-]+\.js$/.test(f))
    .map((f) => path.join(assets, f))
    .sort((a, b) => statSync(b).mtimeMs - statSync(a).mtimeMs);
  if (candidates.length === 0) throw new Error(`No React Router manifest (manifest-*.js) in ${assets}.`);
  const text = readFileSync(candidates[0], "utf8").trim();
  const match = /^window\.__reactRouterManifest\s*=\s*([\s\S]*?);?$/.exec(text);
  if (!match) throw new Error(`Unexpected manifest format in ${candidates[0]}.`);
  return { manifest: JSON.parse(match[1]) as BrowserManifest, file: candidates[0] };
}

/** The route and its ancestors, root first. */
export function routeChain(manifest: BrowserManifest, routeId: string): ManifestRoute[] {
  const chain: ManifestRoute[] = [];
  for (let id: string | undefined = routeId; id; id = manifest.routes[id]?.parentId) {
    const route = manifest.routes[id];
    if (!route) throw new Error(`Route "${id}" is not in the build's manifest (is it in app/routes.ts?).`);
    chain.unshift(route);
  }
  return chain;
}

const filesOf = (route: { module: string; imports?: string[] }) => [route.module, ...(route.imports ?? [])];

/** Static and dynamic imports written into a built chunk: `from"./x.js"`, `import("./x.js")`, `import"./x.js"`. */
export function importsInChunk(code: string): { staticImports: string[]; dynamicImports: string[] } {
  const staticImports = [...code.matchAll(/(?:\bfrom|\bimport)\s*["']([^"']+\.js)["']/g)].map((m) => m[1]);
  const dynamicImports = [...code.matchAll(/\bimport\s*\(\s*["']([^"']+\.js)["']\s*\)/g)].map((m) => m[1]);
  return { staticImports, dynamicImports };
}

/** "/assets/x.js" for a specifier written in `fromUrl` (relative or absolute). */
function resolveUrl(fromUrl: string, specifier: string): string {
  return new URL(specifier, `http://build${fromUrl}`).pathname;
}

export function measureBenchBundle(clientDir: string, routeId = BENCH_ROUTE_ID): BundleFigure {
  const { manifest, file } = readBrowserManifest(clientDir);
  const chain = routeChain(manifest, routeId);
  const section = routeId.split("/").slice(0, 2).join("/") + "/"; // "routes/bench/"
  const shellRoutes = chain.filter((r) => !r.id.startsWith(section));
  const benchRoutes = chain.filter((r) => r.id.startsWith(section));

  const shell = new Set<string>([...filesOf(manifest.entry), ...shellRoutes.flatMap(filesOf)]);
  const benchEager = [...new Set(benchRoutes.flatMap(filesOf))].filter((f) => !shell.has(f));
  const read = (url: string) => readFileSync(path.join(clientDir, url.replace(/^\//, "")));

  // Follow import() from the route's own chunks, then the static imports of what they load.
  const seen = new Set<string>([...shell, ...benchEager]);
  const lazy: string[] = [];
  const queue = benchEager.map((url) => ({ url, lazy: false }));
  while (queue.length > 0) {
    const { url, lazy: isLazy } = queue.shift()!;
    const { staticImports, dynamicImports } = importsInChunk(read(url).toString("utf8"));
    const next = [...dynamicImports.map((s) => ({ s, lazy: true })), ...(isLazy ? staticImports.map((s) => ({ s, lazy: true })) : [])];
    for (const { s } of next) {
      const target = resolveUrl(url, s);
      if (seen.has(target)) continue;
      seen.add(target);
      lazy.push(target);
      queue.push({ url: target, lazy: true });
    }
  }

  const size = (url: string, kind: ChunkSize["kind"]): ChunkSize => {
    const bytes = read(url);
    return { file: url, bytes: bytes.length, gzipBytes: gzipSync(bytes).length, kind };
  };
  const files = [...benchEager.map((u) => size(u, "route")), ...lazy.map((u) => size(u, "lazy"))];
  const kb = (n: number) => Math.round((n / 1024) * 100) / 100;
  const gz = (list: ChunkSize[]) => list.reduce((sum, f) => sum + f.gzipBytes, 0);
  const shellCss = new Set(shellRoutes.flatMap((r) => r.css ?? []));
  const benchCss = [...new Set(benchRoutes.flatMap((r) => r.css ?? []))].filter((c) => !shellCss.has(c));
  const jsGzipKB = kb(gz(files));
  return {
    routeId,
    manifest: path.basename(file),
    routeChain: chain.map((r) => r.id),
    files,
    jsGzipKB,
    jsRawKB: kb(files.reduce((sum, f) => sum + f.bytes, 0)),
    lazyGzipKB: kb(gz(files.filter((f) => f.kind === "lazy"))),
    cssGzipKB: kb(benchCss.reduce((sum, c) => sum + gzipSync(read(c)).length, 0)),
    shellJsGzipKB: kb([...shell].reduce((sum, u) => sum + gzipSync(read(u)).length, 0)),
    targetKB: BUNDLE_TARGET_KB,
    meetsTarget: jsGzipKB < BUNDLE_TARGET_KB,
  };
}
