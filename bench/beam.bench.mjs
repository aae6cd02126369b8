// Beam solver speed, as ratios against baselines measured in the same run (no absolute limits).
// Run: node bench/beam.bench.mjs
// The core is TypeScript; it is bundled in memory with esbuild and imported from a data: URL.
import { build } from 'esbuild';
import { fileURLToPath } from 'node:url';

const entry = fileURLToPath(new URL('../src/core/beam/index.ts', import.meta.url));
const bundle = await build({ entryPoints: [entry], bundle: true, platform: 'node', format: 'esm', write: false, logLevel: 'warning' });
const source = bundle.outputFiles[0].text;
const { solveBeam } = await import(`data:text/javascript;base64,${Buffer.from(source).toString('base64')}`);

/** Median time per call in ms over `rounds` rounds of `repeat` calls each. */
function time(fn, repeat, rounds = 7) {
  for (let i = 0; i < repeat; i++) fn();
  const samples = [];
  for (let r = 0; r < rounds; r++) {
    const start = performance.now();
    for (let i = 0; i < repeat; i++) fn();
    samples.push((performance.now() - start) / repeat);
  }
  samples.sort((a, b) => a - b);
  return samples[samples.length >> 1];
}

// A deterministic generator, so every run times the same beams.
let seed = 12345;
const random = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);

const simpleSpan = {
  span: 6,
  supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 6 }],
  loads: [{ kind: 'udl', w: 10e3, x1: 0, x2: 6 }],
};

function continuousBeam(spans, loadCount) {
  const spanLength = 6;
  const span = spans * spanLength;
  const supports = Array.from({ length: spans + 1 }, (_, i) => ({ kind: i === 0 ? 'pin' : 'roller', x: i * spanLength }));
  const groups = ['dead', 'live', 'snow'];
  const loads = [];
  for (let i = 0; i < loadCount; i++) {
    const group = groups[i % 3];
    const a = random() * span;
    const b = Math.min(span, a + random() * 8);
    switch (i % 4) {
      case 0: loads.push({ kind: 'point', P: 5e3 + 50e3 * random(), x: a, group }); break;
      case 1: loads.push({ kind: 'udl', w: 1e3 + 10e3 * random(), x1: a, x2: b > a ? b : span, group }); break;
      case 2: loads.push({ kind: 'ramp', w1: 10e3 * random(), w2: 10e3 * random(), x1: a, x2: b > a ? b : span, group }); break;
      default: loads.push({ kind: 'moment', M: 20e3 * (random() - 0.5), x: a, group });
    }
  }
  return {
    span,
    supports,
    loads,
    combinations: [
      { name: 'ULS1', factors: [{ group: 'dead', factor: 1.35 }, { group: 'live', factor: 1.5 }, { group: 'snow', factor: 0.75 }] },
      { name: 'ULS2', factors: [{ group: 'dead', factor: 1.35 }, { group: 'live', factor: 1.05 }, { group: 'snow', factor: 1.5 }] },
      { name: 'SLS', factors: [{ group: 'dead', factor: 1 }, { group: 'live', factor: 1 }, { group: 'snow', factor: 1 }] },
    ],
  };
}

/** A note's worth of everyday beams: 1 to 3 spans, a few loads, dead and live, two combinations. */
function typicalBeams(count) {
  const beams = [];
  for (let i = 0; i < count; i++) {
    const spans = 1 + (i % 3);
    const beam = continuousBeam(spans, 3 + (i % 4));
    if (i % 5 === 4) beam.supports = [{ kind: 'fixed', x: 0 }];
    beam.combinations = beam.combinations.slice(0, 2);
    beams.push(beam);
  }
  return beams;
}

const big = continuousBeam(20, 200);
const note = typicalBeams(100);
for (const beam of [big, ...note]) {
  const { beam: result, problems } = solveBeam(beam);
  if (!result) throw new Error(`bench beam did not solve: ${JSON.stringify(problems)}`);
}

// Baseline 1: one simple-span beam with a udl.
const tSimple = time(() => solveBeam(simpleSpan), 2000);
// Baseline 2: a plain Float64 loop touching as many numbers as the big beam's diagrams hold
// (about 3 × 200 breakpoints × 7 coefficients × (3 groups + 3 combinations)).
const loopSize = 3 * 200 * 7 * 6;
const scratch = new Float64Array(loopSize);
const tLoop = time(() => {
  let s = 0;
  for (let i = 0; i < loopSize; i++) {
    scratch[i] = scratch[i] * 0.5 + i;
    s += scratch[i];
  }
  return s;
}, 2000);

const tBig = time(() => solveBeam(big), 20);
const tNote = time(() => { for (const beam of note) solveBeam(beam); }, 5);
const bigResult = solveBeam(big).beam;
const tSample = time(() => bigResult.sample(400), 20);

const pieces = bigResult.combinations[0].pieces.length;
const fmt = (x) => x.toPrecision(3);
console.log('beam solver (median of 7 rounds; ratios are what to watch, not the ms)');
console.log(`  baseline: simple-span udl solve             ${fmt(tSimple)} ms`);
console.log(`  baseline: Float64 loop of ${loopSize} numbers     ${fmt(tLoop)} ms`);
console.log(`  20 spans, 200 loads, 3 groups, 3 combinations (${pieces} pieces per diagram):`);
console.log(`    solve                                      ${fmt(tBig)} ms  = ${fmt(tBig / tSimple)} × simple solve, ${fmt(tBig / tLoop)} × loop`);
console.log(`    envelope sample(400)                       ${fmt(tSample)} ms  = ${fmt(tSample / tSimple)} × simple solve`);
console.log(`  100 typical beams (one note)                 ${fmt(tNote)} ms  = ${fmt(tNote / tSimple)} × simple solve, ${fmt(tNote / 100 / tSimple)} × per beam`);

// Against the core's evaluation of the generated 200-block note (the yardstick of the core's bench),
// with the beams written as notes too: a note of 100 beams through the whole evaluator.
{
  const { loadTs, time: timeMs } = await import('./load.mjs');
  const { generatedNote } = await import('./generate.mjs');
  const core = await loadTs(fileURLToPath(new URL('../src/core/index.ts', import.meta.url)));
  const coreMs = timeMs(() => core.evaluateNote(generatedNote(200)), 5);
  const beamsNote = ['```shear Beams']
    .concat(
      ...Array.from({ length: 100 }, (_, i) => [
        `beam B${i}: ${(6 + (i % 5)).toFixed(1)} m`,
        '  pin at 0 m',
        `  roller at ${(3 + (i % 3)).toFixed(1)} m`,
        `  roller at ${(6 + (i % 5)).toFixed(1)} m`,
        `  dead: udl ${(2 + (i % 7)).toFixed(1)} kN/m`,
        `  live: point ${(10 + i).toFixed(0)} kN at 1.5 m`,
        '  combine ULS = 1.2 dead + 1.6 live',
        `V${i} = B${i}.Vmax`,
      ]),
    )
    .concat(['```'])
    .join('\n');
  const noteMs = timeMs(() => core.evaluateNote(beamsNote), 5);
  const bigMs = tBig;
  console.log(`  against the core's 200-block note evaluation (${fmt(coreMs)} ms):`);
  console.log(`    20-span, 200-load beam solve               ratio ${fmt(bigMs / coreMs)}`);
  console.log(`    note with 100 continuous beams, evaluated  ${fmt(noteMs)} ms, ratio ${fmt(noteMs / coreMs)}`);
}
