// Core evaluation speed, as ratios measured in one run:
// 1. full evaluation of a generated 200-block note / markdown-it render of the same text (target < 1.0);
// 2. the same note evaluated statement by statement with plain mathjs evaluate() (the naive baseline);
// 3. the engine's tau profile / the same profile with mathjs unit arithmetic point by point (target >= 100x faster),
//    and / a bare Float64 loop for a rectangle.
import MarkdownIt from 'markdown-it';
import { create, all } from 'mathjs';
import { generatedNote } from './generate.mjs';
import { loadTs, ratio, time } from './load.mjs';

const core = await loadTs('src/core/index.ts');
const text = generatedNote(200);
const md = new MarkdownIt();

const evalMs = time(() => core.evaluateNote(text), 5);
const mdMs = time(() => md.render(text), 5);

// Naive baseline: every statement through mathjs evaluate() with units, sections done by hand formulas.
const math = create(all);
const naiveMs = time(() => {
  const scope = new Map();
  for (const b of core.extractBlocks(text)) {
    for (const l of b.lines) {
      const m = /^([A-Za-z_]\w*) = (.*)$/.exec(l.text);
      if (m && !m[2].includes('(')) math.evaluate(`${m[1]} = ${m[2]}`, scope);
      else if (m) math.evaluate(`${m[1]} = 1 MPa`, scope);
    }
  }
}, 3);

// tau profile over 1000 heights: engine vs mathjs unit arithmetic vs bare loop (rectangle 200 x 400 mm).
const sec = core.buildSection([{ part: core.plate(0.2, 0.4).part, hole: false }]).section;
const N = 1000;
const engineMs = time(() => {
  const p = sec.profile(N + 1);
  const tau = new Float64Array(p.tauPerV.length);
  for (let i = 0; i < tau.length; i++) tau[i] = 1e5 * p.tauPerV[i];
  return tau;
}, 7);
const pointMs = time(() => {
  let acc = 0;
  for (let i = 0; i <= N; i++) acc += sec.tau(1e5, (0.4 * i) / N).value;
  return acc;
}, 7);
const unitMs = time(() => {
  const b = math.unit(200, 'mm');
  const h = math.unit(400, 'mm');
  const V = math.unit(100, 'kN');
  const I = math.divide(math.multiply(b, math.pow(h, 3)), 12);
  for (let i = 0; i <= N; i++) {
    const y = math.unit((400 * i) / N - 200, 'mm');
    const Q = math.multiply(math.divide(b, 2), math.subtract(math.divide(math.pow(h, 2), 4), math.pow(y, 2)));
    math.divide(math.multiply(V, Q), math.multiply(I, b)).toNumber('MPa');
  }
}, 3);
const bareMs = time(() => {
  const out = new Float64Array(N + 1);
  const b = 0.2, h = 0.4, V = 1e5, I = (b * h ** 3) / 12;
  for (let i = 0; i <= N; i++) {
    const y = (h * i) / N - h / 2;
    out[i] = (V * (b / 2) * (h * h / 4 - y * y)) / (I * b);
  }
  return out;
}, 7);

console.log(`200-block note: evaluate ${evalMs.toFixed(1)} ms, markdown-it render ${mdMs.toFixed(1)} ms -> ratio ${ratio(evalMs, mdMs)} (target < 1.0)`);
console.log(`naive mathjs evaluate() of the same statements: ${naiveMs.toFixed(1)} ms -> engine/naive ${ratio(evalMs, naiveMs)}`);
console.log(`tau profile, ${N + 1} heights: engine ${engineMs.toFixed(3)} ms, mathjs units ${unitMs.toFixed(1)} ms -> engine is ${(unitMs / engineMs).toFixed(0)}x faster (target >= 100x)`);
console.log(`tau profile vs bare Float64 loop for a rectangle: engine/bare ${ratio(engineMs, bareMs)}`);
console.log(`the same ${N + 1} heights as separate tau(V, y) queries (with checks and governing side): ${pointMs.toFixed(3)} ms, ${(unitMs / pointMs).toFixed(0)}x faster than mathjs units`);
