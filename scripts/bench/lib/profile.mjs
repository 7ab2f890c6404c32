// Self time per function and per package from a V8 .cpuprofile (node --cpu-prof).
import { readFileSync } from 'node:fs';

function where(url) {
  if (!url) return '(native)';
  const nm = url.lastIndexOf('node_modules/');
  if (nm >= 0) {
    const rest = url.slice(nm + 'node_modules/'.length).split('/');
    return rest[0].startsWith('@') ? `${rest[0]}/${rest[1]}` : rest[0];
  }
  if (url.startsWith('node:')) return 'node core';
  const m = /\/(server|shared|worker)\/(.*)$/.exec(url);
  return m ? `${m[1]}/${m[2]}` : url.split('/').slice(-2).join('/');
}

export function summarizeProfile(file, top = 25) {
  const prof = JSON.parse(readFileSync(file, 'utf8'));
  const byId = new Map(prof.nodes.map((n) => [n.id, n]));
  const self = new Map();
  let total = 0;
  for (let i = 0; i < prof.samples.length; i++) {
    const dt = prof.timeDeltas[i] ?? 0;
    total += dt;
    self.set(prof.samples[i], (self.get(prof.samples[i]) ?? 0) + dt);
  }
  const fns = new Map();
  const pkgs = new Map();
  for (const [id, t] of self) {
    const n = byId.get(id);
    const cf = n.callFrame;
    const loc = where(cf.url);
    const name = `${cf.functionName || '(anonymous)'} ${loc}${cf.url ? `:${cf.lineNumber + 1}` : ''}`;
    fns.set(name, (fns.get(name) ?? 0) + t);
    const pkg = ['(idle)', '(garbage collector)', '(program)'].includes(cf.functionName) ? cf.functionName : loc.replace(/\/[^/]*$/, (s) => (loc.startsWith('server/') || loc.startsWith('shared/') ? s : ''));
    pkgs.set(pkg, (pkgs.get(pkg) ?? 0) + t);
  }
  const pct = (t) => Math.round((t / total) * 1000) / 10;
  const sort = (m) => [...m.entries()].sort((a, b) => b[1] - a[1]);
  return {
    seconds: Math.round(total / 1e5) / 10,
    top: sort(fns).slice(0, top).map(([name, t]) => ({ name, pct: pct(t) })),
    packages: sort(pkgs).slice(0, 15).map(([name, t]) => ({ name, pct: pct(t) })),
  };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  console.log(JSON.stringify(summarizeProfile(process.argv[2], Number(process.argv[3] ?? 30)), null, 1));
}
