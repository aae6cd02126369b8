// Section engine speed, as ratios measured in one run (a generated note may hold 200 sections):
// 1. buildSection (exact properties + overlap/containment checks) / one polygon-clipping union of the
//    same parts (the validation's own unit of work)                          target <= 3
// 2. exact tau_max (closed-form cubic roots, bracketed Brent on arc slabs) / a 1000-height scan of
//    tau() that would only approximate it                                    target <= 1
// 3. profile(101) for drawing / 101 separate tau() calls                      target <= 2
// plus the absolute time for 200 mixed sections built, maximised and profiled.
import polygonClipping from 'polygon-clipping';
import { loadTs, ratio, time as timeOnce } from './load.mjs';

// The machine is shared: each timing repeats its workload 5 times and takes the median of 9 such runs.
const time = (fn) => timeOnce(() => { for (let r = 0; r < 5; r++) fn(); }, 9) / 5;

const S = await loadTs('src/core/section/index.ts');

/** 200 sections of the kinds a note holds: welded girders, rolled shapes, tubes, boxes, drilled plates, polygons. */
function inputs() {
  const out = [];
  for (let i = 0; i < 200; i++) {
    const k = i % 6, f = 1 + (i % 7) * 0.05;
    let parts;
    if (k === 0) {
      const placed = [];
      for (const p of [S.plate(0.25 * f, 0.016), S.plate(0.01, 0.52 * f), S.plate(0.25 * f, 0.016)]) placed.push(S.translate(p.part, 0, S.topOf(placed)));
      parts = placed.map((part) => ({ part, hole: false }));
    } else if (k === 1) parts = [{ part: S.isection({ d: 0.3 * f, bf: 0.15, tf: 0.0107, tw: 0.0071 }).part, hole: false }];
    else if (k === 2) parts = [{ part: S.tube(0.2 * f, 0.008).part, hole: false }];
    else if (k === 3) parts = [{ part: S.box(0.2, 0.3 * f, 0.01).part, hole: false }];
    else if (k === 4) {
      parts = [
        { part: S.plate(0.2, 0.4 * f).part, hole: false },
        { part: S.translate(S.circle(0.022).part, 0.05, 0.1), hole: true },
        { part: S.translate(S.circle(0.022).part, -0.05, 0.1), hole: true },
      ];
    } else parts = [{ part: S.polygon([[0, 0], [0.3, 0], [0.25 * f, 0.2], [0.15, 0.35], [0.05, 0.2]]).part, hole: false }];
    out.push(parts);
  }
  return out;
}

const all = inputs();
const built = all.map((p) => S.buildSection(p).section);
if (built.some((s) => !s)) throw new Error('a bench section failed to build');

const toRings = (part) =>
  part.map(({ shape: s }) => {
    if (s.kind === 'polygon') return [Array.from(s.xs, (x, i) => [x, s.ys[i]])];
    return [Array.from({ length: 128 }, (_, j) => [s.cx + s.r * Math.cos((j * Math.PI) / 64), s.cy + s.r * Math.sin((j * Math.PI) / 64)])];
  });

// Warm the JIT on every workload once so the ratios compare steady-state code.
for (const p of all) { const s = S.buildSection(p).section; s.tauMax(1); s.profile(101); s.tau(1, s.depth / 2); }

const buildMs = time(() => all.map((p) => S.buildSection(p)));
const unionMs = time(() => all.map((p) => { const rings = p.flatMap((x) => toRings(x.part)); return polygonClipping.union(rings[0], ...rings.slice(1)); }));

// tau_max without its cache: rebuild-free, so measure on fresh sections each run.
const fresh = () => all.map((p) => S.buildSection(p).section);
const pool = Array.from({ length: 45 }, fresh);
let run = 0;
const maxMs = time(() => pool[run++].map((s) => s.tauMax(1)));
const scanMs = time(() => built.map((s) => { let m = 0; for (let i = 0; i <= 1000; i++) m = Math.max(m, s.tau(1, (s.depth * i) / 1000).value); return m; }));

const profileMs = time(() => built.map((s) => s.profile(101)));
const callsMs = time(() => built.map((s) => { const out = new Float64Array(101); for (let i = 0; i <= 100; i++) out[i] = s.tau(1, (s.depth * i) / 100).value; return out; }));

const noteMs = time(() => all.map((p) => { const s = S.buildSection(p).section; s.tauMax(1); return s.profile(101); }));

console.log(`200 sections: build ${buildMs.toFixed(1)} ms, one polygon-clipping union of the same parts ${unionMs.toFixed(1)} ms -> ratio ${ratio(buildMs, unionMs)} (target <= 3)`);
console.log(`exact tau_max ${maxMs.toFixed(2)} ms vs a 1000-height scan ${scanMs.toFixed(2)} ms -> ratio ${ratio(maxMs, scanMs)} (target <= 1)`);
console.log(`profile(101) ${profileMs.toFixed(2)} ms vs 101 tau() calls ${callsMs.toFixed(2)} ms -> ratio ${ratio(profileMs, callsMs)} (target <= 2)`);
console.log(`200 sections built, maximised and profiled: ${noteMs.toFixed(1)} ms (${(noteMs / 200).toFixed(3)} ms per section)`);
