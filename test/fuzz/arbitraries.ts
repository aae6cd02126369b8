/**
 * Generators of notes for the fuzz suites: statements built from the block language's grammar
 * (with extreme numbers, unknown units, hostile names and wrong kinds mixed in), whole notes that
 * declare a section and a beam and then read them in every way the language allows, and mutations
 * of the seed corpus (demo notes and test lines) at the character, token and line level.
 */
import fc from 'fast-check';
import { EXAMPLE_LINES, SEED_NOTES, TEST_LINES } from './seeds';

const pick = <T>(xs: readonly T[]) => fc.constantFrom(...xs);

/** Numbers as a note writes them: ordinary, edge and absurd. */
export const numberText: fc.Arbitrary<string> = fc.oneof(
  { weight: 6, arbitrary: pick(['0', '1', '2', '3', '0.5', '1.5', '10', '12', '16', '100', '250', '300', '520', '7.2', '14.5', '36', '1.2', '0.4', '1_000', '.5', '5/16', '2.']) },
  { weight: 2, arbitrary: pick(['1e308', '1.8e308', '1e-308', '5e-324', '1e-320', '1e300', '1e-300', '9'.repeat(400), '0.000000001', '1e9', '1e22', '4.9e-324', '1e+5', '2E3', '0e0', '00', '0.0']) },
  { weight: 3, arbitrary: fc.integer({ min: 0, max: 10000 }).map(String) },
  { weight: 3, arbitrary: fc.double({ min: 1e-6, max: 1e6, noNaN: true, noDefaultInfinity: true }).map((x) => String(Math.abs(x))) },
);

export const UNITS = ['mm', 'm', 'cm', 'kN', 'N', 'MN', 'MPa', 'kPa', 'Pa', 'GPa', 'kN/m', 'N/mm', 'kN*m', 'kN·m', 'mm^2', 'mm²', 'mm^3', 'mm^4', 'mm⁴', 'in', 'ft', 'kip', 'ksi', 'psi', 'lbf', 'lb', 'klf', 'plf', 'kip/ft', 'kip*ft', 'in^4', 'in²', 'deg', 'rad', 's', 'g'];
const ODD_UNITS = ['furlong', 'kn', 'KN', 'Mpa', 'constructor', '__proto__', 'prototype', 'toString', 'valueOf', 'hasOwnProperty', 'm^7', 'mm^-6', 'm^0', 'mm^99', 'm^1.5', 'K', 'A', 'mol', 'cd', 'bit', 'byte', 'Hz', 'J', 'W', 'L', 'x', 'at', 'to', 'in^-4'];

export const unitText: fc.Arbitrary<string> = fc.oneof({ weight: 8, arbitrary: pick(UNITS) }, { weight: 1, arbitrary: pick(ODD_UNITS) });

/** A quantity: a number, usually with a unit. */
export const quantityText: fc.Arbitrary<string> = fc.tuple(numberText, fc.option(unitText, { freq: 5 })).map(([n, u]) => (u ? `${n} ${u}` : n));

/** Names a note defines and reads; S and B are the section and beam of the structured notes. */
export const NAMES = ['a', 'b', 'V', 'L', 't', 'q', 'y', 'x1', 'S', 'B', 'T', 'G2', 'W1', 'tau_allow', 'y_joint', 'dead', 'live', 'ULS'];
const HOSTILE_NAMES = ['__proto__', 'constructor', 'prototype', 'toString', 'valueOf', 'hasOwnProperty', '__defineGetter__', 'isPrototypeOf', 'then', 'length', 'name', 'call', 'apply', 'bind', 'eval', 'Function', 'globalThis', 'process', 'require', 'import', 'this', 'pi', 'left', 'right', 'to', 'at', 'x', 'from'];
export const nameText: fc.Arbitrary<string> = fc.oneof({ weight: 10, arbitrary: pick(NAMES) }, { weight: 1, arbitrary: pick(HOSTILE_NAMES) }, { weight: 1, arbitrary: fc.stringMatching(/^[A-Za-z_][A-Za-z0-9_]{0,8}$/) });

const FUNCTION_NAMES = ['tau', 'tau_max', 'tau_max_at', 'flow', 'Q', 'width', 'shear', 'moment', 'reaction', 'sqrt', 'abs', 'min', 'max'];
const ODD_FUNCTIONS = ['import', 'evaluate', 'parse', 'createUnit', 'reviver', 'compile', 'simplify', 'derivative', 'resolve', 'constructor', 'toString', 'factorial', 'ones', 'zeros', 'range', 'matrix', 'eval', 'Function', 'cos'];
const MEMBERS = ['A', 'I', 'Iy', 'Ixy', 'yc', 'xc', 'depth', 'Vmax', 'Mmax', 'Mmin', 'span', 'ULS', 'dead', 'live', 'constructor', '__proto__', 'prototype', 'section', 'beam', 'result', 'toString', 'valueOf'];

/** Expressions of the block language, with a sprinkling of the wrong and the hostile. */
export const expressionText: fc.Arbitrary<string> = fc.letrec<{ expr: string }>((tie) => ({
  expr: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    { weight: 5, arbitrary: quantityText },
    { weight: 4, arbitrary: nameText },
    { weight: 1, arbitrary: pick(['pi', 'left', 'right']) },
    { weight: 2, arbitrary: fc.tuple(nameText, pick(MEMBERS)).map(([n, m]) => `${n}.${m}`) },
    {
      weight: 3,
      arbitrary: fc
        .tuple(fc.oneof({ weight: 6, arbitrary: pick(FUNCTION_NAMES) }, { weight: 1, arbitrary: pick(ODD_FUNCTIONS) }), fc.array(tie('expr'), { maxLength: 4 }))
        .map(([f, args]) => `${f}(${args.join(', ')})`),
    },
    { weight: 3, arbitrary: fc.tuple(tie('expr'), pick(['+', '-', '*', '/', '^', ' + ', ' * ', '·', '×', '−']), tie('expr')).map(([l, op, r]) => `${l} ${op} ${r}`) },
    { weight: 1, arbitrary: tie('expr').map((e) => `(${e})`) },
    { weight: 1, arbitrary: tie('expr').map((e) => `-${e}`) },
    { weight: 1, arbitrary: fc.tuple(tie('expr'), unitText).map(([e, u]) => `${e} to ${u}`) },
    { weight: 1, arbitrary: tie('expr').map((e) => `${e}²`) },
  ),
})).expr;

const SHAPE_LINES: fc.Arbitrary<string>[] = [
  fc.tuple(quantityText, quantityText).map(([b, h]) => `plate ${b} x ${h}`),
  quantityText.map((d) => `circle ${d}`),
  fc.tuple(quantityText, quantityText).map(([d, t]) => `tube ${d}, ${t}`),
  fc.tuple(quantityText, quantityText, quantityText).map(([b, h, t]) => `box ${b}, ${h}, ${t}`),
  fc.tuple(pick(['isection', 'tee', 'channel']), quantityText, quantityText, quantityText, quantityText).map(([k, d, bf, tf, tw]) => `${k} d=${d} bf=${bf} tf=${tf} tw=${tw}`),
  fc.tuple(quantityText, quantityText, quantityText).map(([d, b, t]) => `angle d=${d} b=${b} t=${t}`),
  fc
    .tuple(fc.array(fc.tuple(fc.integer({ min: -400, max: 400 }), fc.integer({ min: -50, max: 600 })), { minLength: 0, maxLength: 9 }), fc.option(pick(['mm', 'in', 'm', 'kN']), { freq: 4 }))
    .map(([pts, u]) => `polygon ${pts.map(([x, y]) => `(${x}, ${y})`).join(' ')}${u ? ` ${u}` : ''}`),
];

/** A part line of a section, sometimes a hole, sometimes placed. */
export const partText: fc.Arbitrary<string> = fc
  .tuple(fc.boolean(), fc.oneof(...SHAPE_LINES), fc.option(fc.tuple(quantityText, quantityText), { freq: 3 }))
  .map(([hole, shape, at]) => `  ${hole && !shape.startsWith('polygon') ? 'hole ' : ''}${shape}${at && !shape.startsWith('polygon') ? ` at ${at[0]}, ${at[1]}` : ''}`);

const position = fc.oneof(quantityText, pick(['0 m', '1.2 m', '3.6 m', '7.2 m', '10 m', '0 ft', '14 ft', '18 ft', '-1 m', '1e300 m']));
const lineLoad = fc.oneof(pick(['14.5 kN/m', '2.5 kN/m', '0 kN/m', '0.45 klf', '-3 kN/m', '1e300 kN/m']), fc.tuple(numberText, pick(['kN/m', 'klf', 'plf', 'N/mm', 'kN', 'mm'])).map(([n, u]) => `${n} ${u}`));
const force = fc.oneof(pick(['36 kN', '2.5 kip', '-10 kN', '0 kN', '1e300 kN']), fc.tuple(numberText, pick(['kN', 'kip', 'N', 'kN/m', 'kN*m'])).map(([n, u]) => `${n} ${u}`));
const groupPrefix = fc.option(pick(['dead', 'live', 'snow', 'live2', 'g1', '__proto__', 'constructor', 'toString', 'all loads']), { freq: 2 }).map((g) => (g ? `${g}: ` : ''));

/** A support, load or combination line of a beam. */
export const beamItemText: fc.Arbitrary<string> = fc.oneof(
  fc.tuple(pick(['pin', 'roller', 'fixed']), position).map(([k, x]) => `  ${k} at ${x}`),
  fc.tuple(groupPrefix, force, position).map(([g, p, x]) => `  ${g}point ${p} at ${x}`),
  fc.tuple(groupPrefix, lineLoad, fc.option(fc.tuple(position, position), { freq: 2 })).map(([g, w, r]) => `  ${g}udl ${w}${r ? ` from ${r[0]} to ${r[1]}` : ''}`),
  fc.tuple(groupPrefix, lineLoad, lineLoad, fc.option(fc.tuple(position, position), { freq: 2 })).map(([g, w1, w2, r]) => `  ${g}ramp ${w1} to ${w2}${r ? ` from ${r[0]} to ${r[1]}` : ''}`),
  fc.tuple(groupPrefix, pick(['10 kN*m', '5 kip*ft', '-20 kN*m', '3 kN']), position).map(([g, m, x]) => `  ${g}moment ${m} at ${x}`),
  fc
    .tuple(pick(['ULS', 'SLS', 'c1', '__proto__', 'constructor', 'dead']), fc.array(fc.tuple(fc.option(numberText, { freq: 4 }), pick(['dead', 'live', 'snow', 'live2', 'g1', 'missing', '__proto__'])), { minLength: 1, maxLength: 4 }))
    .map(([n, terms]) => `  combine ${n} = ${terms.map(([f, g]) => (f ? `${f} ${g}` : g)).join(' + ')}`),
);

/** One statement (a header with its indented lines for sections and beams). */
export const statementText: fc.Arbitrary<string> = fc.oneof(
  { weight: 6, arbitrary: fc.tuple(nameText, expressionText).map(([n, e]) => `${n} = ${e}`) },
  { weight: 3, arbitrary: fc.tuple(expressionText, pick(['<=', '<', '>=', '>', '==', '=']), expressionText).map(([l, op, r]) => `check ${l} ${op} ${r}`) },
  { weight: 1, arbitrary: pick(['units SI', 'units US', 'units si', 'units metric', 'units']) },
  { weight: 2, arbitrary: fc.tuple(nameText, fc.option(fc.string({ maxLength: 20 }), { freq: 2 }), fc.array(partText, { maxLength: 5 })).map(([n, title, parts]) => [`section ${n}${title !== null ? `: ${title.replace(/[\r\n]/g, ' ')}` : ''}`, ...parts].join('\n')) },
  { weight: 2, arbitrary: fc.tuple(nameText, position, fc.array(beamItemText, { maxLength: 7 })).map(([n, span, items]) => [`beam ${n}: ${span}`, ...items].join('\n')) },
);

/** Prose, headings, other fences and stamp markers between blocks. */
const proseText: fc.Arbitrary<string> = fc.oneof(
  pick(['', '# Heading', 'Some prose with `code` and *emphasis*.', '> a quote', '- a list item', '    indented code', '```js\nconst x = 1;\n```', '<!-- tauline-results: written by `tauline stamp`; edits inside are replaced -->', '<!-- /tauline-results -->', '| a | b |\n| --- | --- |\n| 1 | 2 |', '<script>alert(1)</script>', '[link](javascript:alert(1))', '~~~\nnot ours\n~~~']),
  fc.string({ maxLength: 40 }),
);

const FENCES = ['```shear', '```shear Girder G2', '~~~shear', '````shear', '```SHEAR', '``` shear', '```shear <b>title</b>', '  ```shear', '> ```shear', '- ```shear', '1. ```shear'];

/** A block: a fence (sometimes unclosed), statements, a closing fence. */
export const blockText: fc.Arbitrary<string> = fc
  .tuple(pick(FENCES), fc.array(statementText, { minLength: 0, maxLength: 8 }), fc.boolean(), fc.nat(20))
  .map(([fence, statements, unclosed, r]) => {
    const close = fence.trimStart().startsWith('~~~') ? '~~~' : fence.trimStart().startsWith('````') ? '````' : '```';
    return [fence, ...statements, ...(unclosed && r < 3 ? [] : [close])].join('\n');
  });

/** A note made from the grammar. */
export const grammarNote: fc.Arbitrary<string> = fc.array(fc.oneof({ weight: 3, arbitrary: blockText }, { weight: 2, arbitrary: proseText }), { minLength: 1, maxLength: 6 }).map((parts) => parts.join('\n\n') + '\n');

/**
 * A note that declares a working section S and beam B and reads them in every way the language
 * allows, so the section engine's and the beam solver's readings get exercised, not just the parser.
 */
export const structuredNote: fc.Arbitrary<string> = fc
  .tuple(
    fc.array(
      fc.oneof(
        { weight: 4, arbitrary: fc.tuple(fc.integer({ min: 1, max: 600 }), fc.integer({ min: 1, max: 600 })).map(([b, h]) => `  plate ${b} mm x ${h} mm`) },
        { weight: 1, arbitrary: fc.integer({ min: 2, max: 600 }).map((d) => `  circle ${d} mm`) },
        { weight: 1, arbitrary: fc.tuple(fc.integer({ min: 20, max: 600 }), fc.integer({ min: 1, max: 30 })).map(([d, t]) => `  tube ${d} mm, ${t} mm`) },
        { weight: 1, arbitrary: fc.tuple(fc.integer({ min: 50, max: 600 }), fc.integer({ min: 50, max: 300 }), fc.integer({ min: 3, max: 25 }), fc.integer({ min: 3, max: 20 })).map(([d, bf, tf, tw]) => `  isection d=${d} mm bf=${bf} mm tf=${tf} mm tw=${tw} mm`) },
        { weight: 1, arbitrary: fc.tuple(fc.integer({ min: 2, max: 50 }), fc.integer({ min: -100, max: 100 }), fc.integer({ min: 0, max: 300 })).map(([d, x, y]) => `  hole circle ${d} mm at ${x} mm, ${y} mm`) },
        { weight: 1, arbitrary: fc.tuple(fc.integer({ min: 10, max: 400 }), fc.integer({ min: 10, max: 400 })).map(([b, h]) => `  polygon (0, 0) (${b}, 0) (${Math.round(b / 2)}, ${h}) mm`) },
        { weight: 1, arbitrary: partText },
      ),
      { minLength: 1, maxLength: 4 },
    ),
    fc.integer({ min: 1, max: 40 }),
    fc.array(beamItemText, { maxLength: 5 }),
    fc.array(
      fc.oneof(
        pick(['V = B.Vmax', 'M = B.Mmax', 'Mn = B.Mmin', 'Ls = B.span', 'A = S.A', 'I = S.I', 'yc = S.yc', 'd = S.depth', 'ya = tau_max_at(S)', 't1 = tau_max(S, 10 kN)', 'w0 = width(S, 0 mm)', 'q0 = Q(S, 0 mm)', 'Vu = B.ULS.Vmax', 'R0 = reaction(B, 0 m)', 'check tau_max(S, 10 kN) <= 100 MPa']),
        fc.tuple(pick(['tau', 'flow']), force, fc.oneof(quantityText, pick(['S.yc', 'S.depth', 'S.depth / 2', 'S.depth - 16 mm', 'tau_max_at(S)', '0 mm', '-1 mm']))).map(([f, v, y]) => `r = ${f}(S, ${v}, ${y})`),
        fc.tuple(pick(['Q', 'width']), fc.oneof(quantityText, pick(['S.yc', 'S.depth', '0 mm', 'S.depth * 2']))).map(([f, y]) => `r = ${f}(S, ${y})`),
        fc.tuple(pick(['shear', 'moment', 'reaction']), pick(['B', 'B.ULS', 'B.dead', 'B.live']), fc.oneof(position, pick(['B.span', 'B.span / 2', 'B.span * 1.0000000001']))).map(([f, b, x]) => `r = ${f}(${b}, ${x})`),
        fc.tuple(pick(['B', 'B.ULS']), position, pick(['left', 'right', 'up'])).map(([b, x, s]) => `r = shear(${b}, ${x}, ${s})`),
        statementText,
      ),
      { maxLength: 8 },
    ),
  )
  .map(([parts, spanM, items, reads]) =>
    ['# Structured note', '', '```shear Section', 'section S: fuzz section', ...parts, '```', '', '```shear Beam', `beam B: ${spanM} m`, '  pin at 0 m', `  roller at ${spanM} m`, '  dead: udl 2 kN/m', '  live: point 10 kN at 0.5 m', '  combine ULS = 1.35 dead + 1.5 live', ...items, '```', '', '```shear Readings', ...reads, '```', ''].join('\n'),
  );

/** Tokens and fragments spliced in by the mutator. */
const SPLICE = [
  ...UNITS, ...ODD_UNITS, ...NAMES, ...HOSTILE_NAMES, ...FUNCTION_NAMES, ...ODD_FUNCTIONS,
  'section', 'beam', 'check', 'units', 'hole', 'at', 'x', 'to', 'from', 'pin', 'roller', 'fixed', 'point', 'udl', 'ramp', 'moment', 'combine',
  '=', '==', '<=', '>=', '<', '>', ':', ',', '.', '(', ')', '((', '))', '^', '^-', '*', '/', '+', '-', '#', '²', '³', '⁴', '·', '×', '−',
  '0', '-0', '1e308', '1e-320', '1e999', '9'.repeat(30), '.', '_', '__', '5/16', '1/0', '0/0',
  '```', '~~~', '```shear', '\n```\n', '\n```shear\n', '<!-- tauline-results -->', '<!-- /tauline-results -->',
  '\t', '\r', '\r\n', '\n', '\n  ', '\u00a0', '\u2028', '\ufeff', '\0', '\ud800', '\udc00', '😀', 'é', 'µ', 'Ω',
  '<script>', '"', "'", '`', '\\', '$', '{', '}', '[', ']', '|', '&', '&amp;', '<img src=x onerror=alert(1)>',
];

export type Mutation =
  | { kind: 'delete'; at: number; length: number }
  | { kind: 'insert'; at: number; piece: number }
  | { kind: 'replace'; at: number; length: number; piece: number }
  | { kind: 'duplicate-line'; line: number; times: number }
  | { kind: 'delete-line'; line: number }
  | { kind: 'swap-lines'; a: number; b: number }
  | { kind: 'insert-line'; line: number; from: number }
  | { kind: 'indent'; line: number; by: number }
  | { kind: 'number'; at: number; piece: number }
  | { kind: 'truncate'; at: number };

export const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 30 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), piece: fc.nat() }),
  fc.record({ kind: fc.constant('replace' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 8 }), piece: fc.nat() }),
  fc.record({ kind: fc.constant('duplicate-line' as const), line: fc.nat(), times: fc.integer({ min: 1, max: 5 }) }),
  fc.record({ kind: fc.constant('delete-line' as const), line: fc.nat() }),
  fc.record({ kind: fc.constant('swap-lines' as const), a: fc.nat(), b: fc.nat() }),
  fc.record({ kind: fc.constant('insert-line' as const), line: fc.nat(), from: fc.nat() }),
  fc.record({ kind: fc.constant('indent' as const), line: fc.nat(), by: fc.integer({ min: -4, max: 6 }) }),
  fc.record({ kind: fc.constant('number' as const), at: fc.nat(), piece: fc.nat() }),
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
);

const EXTREME_NUMBERS = ['0', '1e308', '1e-308', '5e-324', '1e300', '-1', '0.000001', '1e9', '99999999999999999999', '1.7976931348623157e308'];
const SPLICE_LINES = [...TEST_LINES, ...EXAMPLE_LINES];

/** Applies mutations in order; positions wrap around the current text, so every mutation applies. */
export function mutate(text: string, mutations: readonly Mutation[]): string {
  let t = text;
  for (const m of mutations) {
    const n = t.length;
    switch (m.kind) {
      case 'delete': {
        if (n === 0) break;
        const at = m.at % n;
        t = t.slice(0, at) + t.slice(at + m.length);
        break;
      }
      case 'insert': {
        const at = n === 0 ? 0 : m.at % (n + 1);
        t = t.slice(0, at) + SPLICE[m.piece % SPLICE.length] + t.slice(at);
        break;
      }
      case 'replace': {
        if (n === 0) break;
        const at = m.at % n;
        t = t.slice(0, at) + SPLICE[m.piece % SPLICE.length] + t.slice(at + m.length);
        break;
      }
      case 'number': {
        const spots = [...t.matchAll(/\d+(\.\d+)?(e[+-]?\d+)?/g)];
        if (spots.length === 0) break;
        const s = spots[m.at % spots.length]!;
        t = t.slice(0, s.index) + EXTREME_NUMBERS[m.piece % EXTREME_NUMBERS.length] + t.slice(s.index! + s[0].length);
        break;
      }
      case 'truncate':
        t = t.slice(0, n === 0 ? 0 : m.at % (n + 1));
        break;
      default: {
        const lines = t.split('\n');
        const L = lines.length;
        if (m.kind === 'duplicate-line') {
          const i = m.line % L;
          lines.splice(i, 0, ...Array<string>(m.times).fill(lines[i]!));
        } else if (m.kind === 'delete-line') {
          lines.splice(m.line % L, 1);
        } else if (m.kind === 'swap-lines') {
          const a = m.a % L;
          const b = m.b % L;
          [lines[a], lines[b]] = [lines[b]!, lines[a]!];
        } else if (m.kind === 'insert-line') {
          lines.splice(m.line % (L + 1), 0, SPLICE_LINES.length ? SPLICE_LINES[m.from % SPLICE_LINES.length]! : '');
        } else if (m.kind === 'indent') {
          const i = m.line % L;
          lines[i] = m.by >= 0 ? ' '.repeat(m.by) + lines[i] : lines[i]!.replace(new RegExp(`^ {0,${-m.by}}`), '');
        }
        t = lines.join('\n');
      }
    }
  }
  return t;
}

/** A seed note with a few mutations applied. */
export const mutatedNote: fc.Arbitrary<string> = fc
  .tuple(fc.nat(SEED_NOTES.length - 1), fc.array(mutation, { minLength: 1, maxLength: 8 }))
  .map(([i, ms]) => mutate(SEED_NOTES[i]!, ms));

/** Any note the fuzzers make: grammar, structured or mutated. */
export const anyNote: fc.Arbitrary<string> = fc.oneof({ weight: 2, arbitrary: grammarNote }, { weight: 2, arbitrary: structuredNote }, { weight: 3, arbitrary: mutatedNote });
