/**
 * Hostile notes: the escapes known for mathjs-style expression evaluators (constructor chains,
 * prototype pollution, import/evaluate/createUnit reached through objects and functions, huge
 * exponents, giant matrices and ranges, deep nesting, factorials), pathological Markdown (100,000
 * backticks, unclosed fences, 1 MB lines, thousands of blocks, the longest statements the limits
 * allow) and rendering payloads. Each escape attempt gets an error diagnostic on its own line;
 * nothing reaches Object.prototype; every case goes through the evaluator, the JSON contract, the
 * stamper and the renderer, and its time and memory are measured and printed.
 */
import MarkdownIt from 'markdown-it';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { noteToJson } from '../../src/core/contract';
import { evaluateNote, type NoteResult } from '../../src/core/note';
import { buildSection, makePolygon, polygon } from '../../src/core/section';
import { readStamps, stampText, stripStamps } from '../../src/core/stamp';
import { shearPlugin } from '../../src/render/plugin';
import { checkHtml, checkNote, prototypeSnapshot } from '../fuzz/invariants';
import { HOSTILE_NOTES } from '../render/xss-corpus';

interface Measured {
  name: string;
  chars: number;
  evaluateMs: number;
  renderMs: number;
  heapMB: number;
  rssMB: number;
  diagnostics: number;
}
const table: Measured[] = [];
let snapshot = '';

beforeAll(() => {
  snapshot = prototypeSnapshot();
});

afterAll(() => {
  const rows = table.map((m) => `${m.name.padEnd(58)} ${String(m.chars).padStart(9)} ${m.evaluateMs.toFixed(0).padStart(7)} ${m.renderMs.toFixed(0).padStart(7)} ${m.heapMB.toFixed(1).padStart(8)} ${m.rssMB.toFixed(0).padStart(6)} ${String(m.diagnostics).padStart(6)}`);
  console.log(['hostile notes: time and memory', `${'case'.padEnd(58)} ${'chars'.padStart(9)} ${'eval ms'.padStart(7)} ${'rend ms'.padStart(7)} ${'heap +MB'.padStart(8)} ${'rss MB'.padStart(6)} ${'diags'.padStart(6)}`, ...rows].join('\n'));
});

const md = new MarkdownIt({ html: false, linkify: true, typographer: true }).use(shearPlugin);

function expectUntouched(): void {
  expect(prototypeSnapshot()).toBe(snapshot);
  const probe = {} as Record<string, unknown>;
  for (const k of ['polluted', 'x', 'isAdmin', 'toString2']) expect(probe[k], k).toBeUndefined();
  expect(typeof ({} as { constructor: unknown }).constructor).toBe('function');
}

/** Runs a note through evaluator, JSON contract, stamper and renderer, measuring each. */
function runAll(name: string, text: string, options: { render?: boolean } = {}): NoteResult {
  const heapBefore = process.memoryUsage().heapUsed;
  let t = process.hrtime.bigint();
  const note = evaluateNote(text);
  const evaluateMs = Number(process.hrtime.bigint() - t) / 1e6;
  expect(checkNote(text, note), name).toEqual([]);
  JSON.stringify(noteToJson('hostile.md', note));
  const stamped = stampText(text, note);
  expect(stripStamps(stamped.text).text, `${name}: stamps change nothing outside their markers`).toBe(stripStamps(text).text);
  let renderMs = 0;
  if (options.render !== false) {
    t = process.hrtime.bigint();
    const html = md.render(text, {});
    renderMs = Number(process.hrtime.bigint() - t) / 1e6;
    expect(checkHtml(html, text), name).toEqual([]);
  }
  const heapMB = (process.memoryUsage().heapUsed - heapBefore) / 1e6;
  table.push({ name, chars: text.length, evaluateMs, renderMs, heapMB, rssMB: process.memoryUsage().rss / 1e6, diagnostics: note.diagnostics.length });
  expectUntouched();
  return note;
}

// A context every escape line can reach for: a section S, a beam B, a quantity a.
const CONTEXT = ['section S: context', '  plate 100 mm x 200 mm', 'beam B: 4 m', '  pin at 0 m', '  roller at 4 m', '  dead: udl 2 kN/m', 'a = 1 m'];
const LINE = CONTEXT.length + 1; // the hostile line's 0-based Markdown line (after the fence)

function escapeNote(line: string): string {
  return ['```shear', ...CONTEXT, line, 'after = 2 m', '```', ''].join('\n');
}

const deep = (open: string, close: string, n: number, inner = '1') => `${open.repeat(n)}${inner}${close.repeat(n)}`;

const ESCAPES: Record<string, string[]> = {
  'constructor chains': [
    'x = constructor',
    'x = constructor.constructor',
    'x = (1 m).constructor',
    'x = (1 m).constructor.constructor("return process")()',
    'x = pi.constructor',
    'x = tau.constructor',
    'x = S.constructor',
    'x = S.constructor.constructor',
    'x = B.constructor.prototype',
    'x = S.__proto__',
    'x = B.__proto__.polluted',
    'x = S.section',
    'x = B.beam',
    'x = B.result.combinations',
    'x = S.prototype',
    'x = sqrt.constructor("return process")()',
    'x = a.constructor.name',
    'x = B.dead.constructor',
  ],
  'prototype pollution through names': [
    '__proto__ = 1 m',
    '__proto__.polluted = 1',
    'constructor.prototype.polluted = 1',
    'x = __proto__',
    'x = __proto__.polluted',
    '__defineGetter__ = 1 m',
    'section __proto__',
    'beam __proto__: 4 m',
    'x = B.__proto__',
    'x = tau(__proto__, 1 kN, 0 mm)',
  ],
  'import, evaluate and createUnit through objects and functions': [
    'x = import("fs")',
    'x = evaluate("1 + 1")',
    'x = parse("1")',
    'x = compile("1")',
    'x = createUnit("foo", "1 m")',
    'x = reviver("x")',
    'x = simplify("x")',
    'x = derivative("x^2", "x")',
    'x = resolve("x")',
    'x = chain(1)',
    'x = config({})',
    'x = math.import({})',
    'x = tau.call(S, 1 kN, 0 mm)',
    'x = FUNCTIONS.tau',
    'x = Function("return this")()',
    'x = eval("1")',
    'x = require("child_process")',
    'x = process.exit(1)',
    'x = globalThis.process',
    'x = this',
    'x = S.tauMax(1 kN)',
    'x = max.apply(0, 1)',
    'x = 1 m to constructor',
    'x = 1 __proto__',
    'x = 1 prototype',
    'x = 1 createUnit',
    'x = 1 foo to evaluate',
  ],
  'strings, indexing and code': [
    'x = "text"',
    "x = 'text'",
    'x = `text`',
    'x = [1, 2]',
    'x = {a: 1}',
    'x = a[0]',
    'x = a => 1',
    'x = function () { return 1 }',
    'x = 1; y = 2',
    'x = 1 m \\ 2',
    'x = $1',
    'x = @foo',
    'x = 1 m ? 2 : 3',
    'x = a = 1',
    'x = a.b = 1',
    'x = \\u0063onstructor',
    'x = ${a}',
  ],
  'huge numbers, exponents, factorials, matrices and ranges': [
    'x = 10 ^ 400',
    'x = 1e999',
    `x = ${'9'.repeat(400)}`,
    'x = 2 ^ 2 ^ 2 ^ 2 ^ 2 ^ 2',
    'x = (1e200 m) * (1e200 m)',
    'x = (1 m) ^ 1e9',
    'x = 1 m^99',
    'x = 1 m^-99',
    'x = 9999999999!',
    'x = factorial(1e6)',
    'x = gamma(1e300)',
    'x = 1:1e9',
    'x = -Infinity:Infinity',
    'x = 0:0:0',
    'x = ones(1e6, 1e6)',
    'x = zeros(1e9)',
    'x = matrix([[1, 2], [3, 4]])',
    'x = range(1, 1e12)',
    'x = 1 / 0',
    'x = 0 / 0',
    'x = 0 m / 0 m',
    'x = sqrt(-1 m^2)',
    'x = max()',
    'x = max(1 m, 1 kN)',
    'x = 1e308 * 10',
    'x = -1e308 - 1e308',
    'x = Infinity',
    'x = NaN',
    'x = tau(S, 1e308 kN, 100 mm)',
    'x = shear(B, 1e308 m)',
    'x = moment(B, -1 m)',
    'check 1 kN <= 0 kN',
  ],
  'deep nesting and long chains': [
    `x = ${deep('(', ')', 10000)}`,
    `x = ${'-'.repeat(3000)}1`,
    `x = ${deep('sqrt(', ')', 200)}`,
    `x = ${Array(1000).fill('1').join('^')}`,
    `x = a${'.b'.repeat(1000)}`,
    `x = ${deep('max(', ')', 300)}`,
    `x = ${Array(1200).fill('1').join(' + ')}`,
    `x = ${'a'.repeat(5000)}`,
    `x = 1 ${'m*'.repeat(800)}m`,
  ],
};

describe('expression escapes', () => {
  for (const [group, lines] of Object.entries(ESCAPES)) {
    it(`${group}: every line is an error on its own line, and the rest of the note evaluates`, () => {
      for (const line of lines) {
        const text = escapeNote(line);
        const note = runAll(`${group}: ${line.slice(0, 40)}`, text, { render: line.length < 2000 });
        const here = note.diagnostics.filter((d) => d.line === LINE && d.severity === 'error');
        expect(here.length, `no error on: ${line.slice(0, 80)}`).toBeGreaterThan(0);
        // The context above and the line below still evaluate.
        const names = note.blocks[0]!.results.filter((r) => !r.failed).map((r) => r.name);
        expect(names, line.slice(0, 80)).toEqual(expect.arrayContaining(['S', 'B', 'a', 'after']));
        expect(note.diagnostics.filter((d) => d.line !== LINE && d.severity === 'error'), line.slice(0, 80)).toEqual([]);
      }
    }, 120_000);
  }

  it('words like constructor, __proto__ and toString used as load groups, combinations and names stay ordinary names of the note', () => {
    const text = ['```shear', 'beam B: 4 m', '  pin at 0 m', '  roller at 4 m', '  __proto__: udl 1 kN/m', '  constructor: udl 1 kN/m', '  combine toString = 1.0 constructor + 1.0 __proto__', 'V = B.constructor.Vmax', 'W = B.toString.Vmax', 'constructor = 1 m', 'hasOwnProperty = 2 m', 'valueOf = constructor + hasOwnProperty', '```', ''].join('\n');
    const note = runAll('prototype words as ordinary names', text);
    expect(note.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    const values = noteToJson('n.md', note).blocks[0]!.values;
    expect(Object.getPrototypeOf(values)).toBeNull();
    // udl 1 kN/m on a 4 m simple span: V = wL/2 = 2 kN per group (closed form); the combination takes both.
    expect(values.V).toMatchObject({ si: 2000 });
    expect(values.W).toMatchObject({ si: 4000 });
    expect(values.valueOf).toMatchObject({ si: 3 });
    const round = JSON.parse(JSON.stringify(noteToJson('n.md', note))) as { blocks: { values: Record<string, unknown> }[] };
    expect(Object.keys(round.blocks[0]!.values)).toEqual(['B', 'V', 'W', 'constructor', 'hasOwnProperty', 'valueOf']);
  });
});

/** A block with `lines` as its content. */
const block = (lines: string[], info = 'shear') => ['```' + info, ...lines, '```', ''].join('\n');
const MB = 1_000_000;

describe('pathological Markdown', () => {
  it('100,000 backticks as prose, as a block line and as fences', () => {
    const ticks = '`'.repeat(100_000);
    expect(runAll('100,000 backticks as prose', ticks).blocks).toHaveLength(0);
    // Inside a backtick fence such a line closes it; a tilde fence keeps it as a line of the block.
    const inside = runAll('100,000 backticks inside a block', ['~~~shear', 'a = 1 m', ticks, 'b = 2 m', '~~~', ''].join('\n'));
    expect(inside.diagnostics.map((d) => [d.line, d.code])).toEqual([[2, 'syntax.too-long']]);
    const fenced = runAll('a block between 100,000-backtick fences', `${ticks}shear\nx = 1 m\n${ticks}\n`);
    expect(fenced.blocks).toHaveLength(1);
    expect(fenced.diagnostics).toEqual([]);
  }, 120_000);

  it('unclosed fences: the block runs to the end of the file, its bad lines are errors, and it gets no stamp', () => {
    const one = runAll('one unclosed fence', '# Note\n\n```shear\nx = 1 m\ny = x * 2\n');
    expect(one.blocks[0]!.block.closed).toBe(false);
    expect(one.diagnostics).toEqual([]);
    expect(stampText('# Note\n\n```shear\nx = 1 m\ny = x * 2\n', one).problems.map((p) => p.code)).toEqual(['stamp.unclosed-block']);
    const many = runAll('2,000 unclosed fences', Array.from({ length: 2000 }, (_v, i) => `\`\`\`shear\nx${i} = ${i} m`).join('\n'));
    expect(many.blocks).toHaveLength(1);
    expect(many.diagnostics.filter((d) => d.code === 'syntax.character')).toHaveLength(1999);
  }, 120_000);

  it('1 MB lines: in prose, in a block, as a title, as a comment', () => {
    const line = 'a'.repeat(MB);
    expect(runAll('1 MB line of prose', `${line}\n${block(['x = 1 m'])}`).diagnostics).toEqual([]);
    expect(runAll('1 MB statement', block([`x = ${'1'.repeat(MB)}`, 'y = 1 m'])).diagnostics.map((d) => d.code)).toEqual(['syntax.too-long']);
    const titled = runAll('1 MB title', block(['x = 1 m'], `shear ${line}`));
    expect(titled.blocks[0]!.block.title.length).toBe(MB);
    expect(runAll('1 MB comment', block([`x = 1 m # ${line}`])).diagnostics.map((d) => d.code)).toEqual(['syntax.too-long']);
  }, 120_000);

  it('thousands of blocks, the longest block, and deep Markdown nesting', () => {
    const blocks = Array.from({ length: 5000 }, (_v, i) => block([`v${i} = ${i} kN`, i > 0 ? `check v${i} >= v${i - 1}` : 'w = 1 m'])).join('\n');
    expect(runAll('5,000 blocks with a check each', blocks, { render: true }).blocks).toHaveLength(5000);
    const long = runAll('a block of 20,001 lines', block(Array.from({ length: 20_001 }, (_v, i) => `v${i} = ${i} kN`)));
    expect(long.diagnostics.map((d) => d.code)).toEqual(['block.too-long']);
    // Past the reader's nesting limit a block cannot be read: it is an error on its fence, never silently left out of the checks.
    const quoted = runAll('a block inside 5,000 nested block quotes', `${'> '.repeat(5000)}\`\`\`shear\n${'> '.repeat(5000)}check 2 m <= 1 m\n${'> '.repeat(5000)}\`\`\`\n`);
    expect(quoted.diagnostics.map((d) => [d.line, d.code])).toEqual([[0, 'block.too-deep']]);
    const nested = (levels: number) => `${Array.from({ length: levels }, (_v, i) => `${' '.repeat(i * 2)}- item`).join('\n')}\n\n\`\`\`shear\ncheck 2 m <= 1 m\n\`\`\`\n`;
    const listed = runAll('a block after 1,000 nested list items', nested(1000));
    expect(listed.diagnostics.map((d) => [d.line, d.code])).toEqual([[1001, 'block.too-deep']]);
    const shallow = runAll('a block after 30 nested list items', nested(30));
    expect(shallow.diagnostics.map((d) => d.code)).toEqual(['check.fails']);
  }, 180_000);

  it('control characters, lone surrogates, odd line endings and a BOM', () => {
    const odd = runAll('NUL, lone surrogates, U+2028 inside a block', block(['a = 1 m', 'b = 1\u0000 m', 'c = \ud800', 'd = 2 m\u2028e = 3 m', 'f = 1 m']));
    expect(odd.diagnostics.filter((d) => d.severity === 'error').map((d) => d.line)).toEqual([2, 3, 4]);
    for (const [name, eol] of [['CR', '\r'], ['CRLF', '\r\n'], ['mixed', '\n\r\n\r']] as const) {
      const text = `\ufeff# Note${eol}${eol}\`\`\`shear${eol}x = 1 m${eol}y = x * 3${eol}\`\`\`${eol}`;
      const r = runAll(`${name} line endings with a BOM`, text);
      expect(r.diagnostics).toEqual([]);
      const stamped = stampText(text, r);
      expect(stamped.text.startsWith('\ufeff')).toBe(true);
      expect(stripStamps(stamped.text).text).toBe(text);
    }
  });

  it('markdown-it complexity traps through the renderer: linkify with 70,000 stars, 70,000 quotes, 50,000 emphasis markers', () => {
    runAll('linkify: http://x/ and 70,000 stars', `http://x/${'*'.repeat(70_000)}\n\n${block(['x = 1 m'])}`);
    runAll('typographer: 70,000 quotes', `${'"a'.repeat(70_000)}\n\n${block(['x = 1 m'])}`);
    runAll('50,000 emphasis markers', `${'*a_'.repeat(50_000)}\n\n${block(['x = 1 m'])}`);
  }, 120_000);

  it('stamp markers by the thousand: damaged stamps are reported and left alone', () => {
    const text = `${block(['x = 1 m'])}\n${'<!-- tauline-results: forged -->\n'.repeat(10_000)}`;
    runAll('10,000 forged start markers', text);
    expect(readStamps(text).problems.length).toBeGreaterThan(0);
    const out = stampText(text, evaluateNote(text));
    expect(out.text.slice(out.text.indexOf('<!-- tauline-results: forged'))).toBe(text.slice(text.indexOf('<!-- tauline-results: forged')));
  }, 120_000);
});

describe('the largest inputs the limits allow', () => {
  it('a section of 19,000 part lines, a beam at its load limit and one past it', () => {
    runAll('section of 19,000 stacked plates (one statement)', block(['section S', ...Array.from({ length: 19_000 }, () => '  plate 10 mm x 1 mm'), 't = tau_max(S, 1 kN)']), { render: false });
    const loads = (n: number) => block(['beam B: 10 m', '  pin at 0 m', '  roller at 10 m', ...Array.from({ length: n }, (_v, i) => `  point 1 kN at ${((i % 999) / 100 + 0.005).toFixed(3)} m`), 'V = B.Vmax']);
    expect(runAll('beam with 5,000 point loads', loads(5000), { render: false }).diagnostics).toEqual([]);
    expect(runAll('beam with 5,001 point loads', loads(5001), { render: false }).diagnostics.map((d) => d.code)).toContain('beam.too-large');
  }, 180_000);

  it('polygons at and past the vertex limit (through the engine: a note line holds far fewer points)', () => {
    const ring = (n: number) => Array.from({ length: n }, (_v, i) => [Math.cos((2 * Math.PI * i) / n), 1 + Math.sin((2 * Math.PI * i) / n)] as [number, number]);
    const t0 = process.hrtime.bigint();
    const at = buildSection([{ part: polygon(ring(4096)).part!, hole: false }]);
    const ms = Number(process.hrtime.bigint() - t0) / 1e6;
    console.log(`polygon of 4,096 vertices built and read in ${ms.toFixed(0)} ms`);
    expect(at.section!.tauMax(1).problem).toBeUndefined();
    const past = makePolygon(...(() => {
      const pts = ring(4097);
      return [pts.map((p) => p[0]), pts.map((p) => p[1])] as const;
    })());
    expect(past.problems.map((p) => p.code)).toEqual(['section.too-many-vertices']);
    expectUntouched();
  });
});

describe('rendering payloads', () => {
  it('the renderer corpus: evaluated, stamped and rendered with raw HTML off, nothing injected', () => {
    for (const n of HOSTILE_NOTES) {
      runAll(`render corpus: ${n.name}`, n.text);
      // Stamps are Markdown tables that code hosts render: a payload from the note must not arrive there as a tag.
      for (const e of stampText(n.text, evaluateNote(n.text)).edits) expect(stripMarkers(e.newText), n.name).not.toMatch(/<[a-zA-Z/!?]/);
    }
  }, 120_000);

  it('payloads in titles, comments, section titles and bad lines are escaped in the cards under a host with raw HTML on', () => {
    const vscodeLike = new MarkdownIt({ html: true, linkify: true }).use(shearPlugin);
    const payloads = ['<script>window.x=1</script>', '"><img src=x onerror=alert(1)>', '</div></div><svg onload=alert(1)>', '<style>*{display:none}</style>', '\\href{javascript:alert(1)}{x}', '<!-- tauline-results: x -->'];
    for (const p of payloads) {
      const text = ['```shear ' + p, `section S: ${p}`, `  plate 10 mm x 20 mm # ${p}`, `x = 1 m # ${p}`, p, '```', ''].join('\n');
      const html = vscodeLike.render(text, {});
      for (const card of cardsOf(html)) expect(checkHtml(card, text), p).toEqual([]);
      expect(cardsOf(html)).toHaveLength(1);
      expectUntouched();
    }
  });
});

function stripMarkers(text: string): string {
  return text.replace(/<!-- \/?tauline-results[^>]*-->/g, '');
}

/** The card elements of rendered HTML (from `<div class="tl-card` to its matching `</div>`). */
function cardsOf(html: string): string[] {
  const out: string[] = [];
  let from = 0;
  for (;;) {
    const start = html.indexOf('<div class="tl-card', from);
    if (start < 0) return out;
    let depth = 0;
    const re = /<div\b|<\/div>/g;
    re.lastIndex = start;
    let end = html.length;
    for (let m = re.exec(html); m; m = re.exec(html)) {
      depth += m[0] === '</div>' ? -1 : 1;
      if (depth === 0) {
        end = m.index + m[0].length;
        break;
      }
    }
    out.push(html.slice(start, end));
    from = end;
  }
}
