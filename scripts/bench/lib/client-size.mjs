// First-load JavaScript of client routes from the Vite build manifest: the entry chunk and its static
// imports, plus the route's lazy chunk and its static imports; each file gzipped with zlib (level 9,
// what a static server with precompressed assets would send; level 6 is within ~1 %).
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { repoRoot, run } from '../../stack/common.mjs';

export async function clientBench(outDir) {
  const build = await run(process.execPath, ['node_modules/vite/bin/vite.js', 'build', '--outDir', outDir, '--emptyOutDir'], { cwd: repoRoot });
  if (build.code !== 0) return { error: `vite build failed:\n${(build.stdout + build.stderr).slice(-2000)}` };
  const manifest = JSON.parse(readFileSync(path.join(outDir, '.vite/manifest.json'), 'utf8'));
  const gz = new Map();
  const size = (file) => {
    if (!gz.has(file)) {
      const buf = readFileSync(path.join(outDir, file));
      gz.set(file, { raw: buf.length, gzip: gzipSync(buf, { level: 9 }).length });
    }
    return gz.get(file);
  };
  const closure = (keys) => {
    const seen = new Set();
    const files = new Set();
    const css = new Set();
    const visit = (k) => {
      if (seen.has(k)) return;
      seen.add(k);
      const e = manifest[k];
      if (!e) return;
      files.add(e.file);
      for (const c of e.css ?? []) css.add(c);
      for (const i of e.imports ?? []) visit(i);
    };
    keys.forEach(visit);
    return { keys: seen, files: [...files], css: [...css] };
  };
  const sum = (files) => files.reduce((a, f) => ({ raw: a.raw + size(f).raw, gzip: a.gzip + size(f).gzip }), { raw: 0, gzip: 0 });
  const entryKey = Object.keys(manifest).find((k) => manifest[k].isEntry);
  const shell = closure([entryKey]);
  const routesDir = path.join(repoRoot, 'src/app/routes');
  const routeFiles = existsSync(routesDir) ? readdirSync(routesDir) : [];
  const route = (re) => {
    const files = routeFiles.filter((f) => re.test(f)).map((f) => `src/app/routes/${f}`);
    const keys = files.filter((k) => manifest[k]);
    if (!keys.length) return { present: false, sourceFiles: files };
    const c = closure([entryKey, ...keys]);
    const lazy = new Set();
    for (const k of c.keys) for (const d of manifest[k]?.dynamicImports ?? []) if (!c.keys.has(d)) lazy.add(manifest[d]?.file ?? d);
    return {
      present: true,
      sourceFiles: keys,
      js: sum(c.files),
      css: sum(c.css),
      files: c.files.map((f) => ({ file: f, ...size(f) })).sort((a, b) => b.gzip - a.gzip),
      lazyFromHere: [...lazy],
      includesMaplibre: c.files.some((f) => /maplibre/.test(f)),
    };
  };
  const maplibre = Object.values(manifest).find((e) => /maplibre/.test(e.file) && e.file.endsWith('.js'));
  return {
    entry: entryKey,
    shell: { js: sum(shell.files), css: sum(shell.css), files: shell.files.map((f) => ({ file: f, ...size(f) })), includesMaplibre: shell.files.some((f) => /maplibre/.test(f)) },
    pondside: route(/^pondside.*\.tsx$/),
    map: route(/^map.*\.tsx$/),
    maplibreChunk: maplibre ? { file: maplibre.file, ...size(maplibre.file) } : null,
  };
}
