/**
 * Completions inside `shear` blocks, by context: statement keywords at the start of a line, part
 * shapes under a `section`, supports and loads under a `beam`, members after `S.` (section
 * properties, or a beam's results and combinations), units after a number or `to`, and otherwise
 * the names defined above, the functions (with signature help) and the units.
 */
import { type CompletionItem, CompletionItemKind, InsertTextFormat, type Position, type SignatureHelp } from 'vscode-languageserver';
import { BEAM_MEMBERS, FUNCTIONS, SECTION_MEMBERS } from '../../core/evaluate';
import { PART_SHAPES } from '../../core/statements';
import { lookupUnit } from '../../core/units';
import { blockAt, definitionsVisibleAt, type NoteAnalysis } from '../analysis';
import { lineResult, presenter } from '../present';
import type { ServerSettings } from '../settings';

/** Units offered by completion, the ones engineers write most (every one is checked against the catalogue). */
const COMMON_UNITS = ['mm', 'cm', 'm', 'N', 'kN', 'MN', 'Pa', 'kPa', 'MPa', 'GPa', 'in', 'ft', 'lbf', 'lb', 'kip', 'psi', 'ksi', 'psf', 'ksf', 'plf', 'klf'];

const STATEMENTS: { label: string; snippet: string; doc: string }[] = [
  { label: 'section', snippet: 'section ${1:S}: ${2:title}\n  plate ${3:200 mm} x ${4:20 mm}', doc: 'A cross-section; indent its parts under it (plate, circle, tube, box, isection, tee, channel, angle, polygon, hole).' },
  { label: 'beam', snippet: 'beam ${1:B}: ${2:6 m}\n  pin at 0 m\n  roller at ${2:6 m}\n  udl ${3:10 kN/m}', doc: 'A beam; indent supports (pin, roller, fixed at X) and loads (point, udl, ramp, moment) under it.' },
  { label: 'check', snippet: 'check ${1:demand} <= ${2:limit}', doc: 'Compares two quantities (<=, <, >=, >) and gives pass / FAIL with the utilisation. The limit is yours to write.' },
  { label: 'units', snippet: 'units ${1|SI,US|}', doc: 'The unit system results are shown in.' },
];

const PART_SNIPPETS: Record<string, string> = {
  plate: 'plate ${1:B} x ${2:H}',
  circle: 'circle ${1:D}',
  tube: 'tube ${1:D}, ${2:T}',
  box: 'box ${1:B}, ${2:H}, ${3:T}',
  isection: 'isection d=${1} bf=${2} tf=${3} tw=${4}',
  tee: 'tee d=${1} bf=${2} tf=${3} tw=${4}',
  channel: 'channel d=${1} bf=${2} tf=${3} tw=${4}',
  angle: 'angle d=${1} b=${2} t=${3}',
  polygon: 'polygon (${1:0}, ${2:0}) (${3:100}, ${4:0}) (${5:50}, ${6:80}) ${7:mm}',
};

const BEAM_ITEMS: { label: string; snippet: string; doc: string }[] = [
  { label: 'pin', snippet: 'pin at ${1:0 m}', doc: 'A pinned support (vertical reaction).' },
  { label: 'roller', snippet: 'roller at ${1:X}', doc: 'A roller support (vertical reaction).' },
  { label: 'fixed', snippet: 'fixed at ${1:0 m}', doc: 'A fixed support (vertical reaction and moment).' },
  { label: 'point', snippet: 'point ${1:P} at ${2:X}', doc: 'A point load, positive downward.' },
  { label: 'udl', snippet: 'udl ${1:w}', doc: 'A uniform line load over the span, or `from X1 to X2`.' },
  { label: 'ramp', snippet: 'ramp ${1:w1} to ${2:w2}', doc: 'A linearly varying line load, optionally `from X1 to X2`.' },
  { label: 'moment', snippet: 'moment ${1:M} at ${2:X}', doc: 'An applied moment, positive clockwise.' },
  { label: 'combine', snippet: 'combine ${1:ULS} = ${2:1.2} ${3:dead} + ${4:1.6} ${5:live}', doc: 'A factored combination of load groups (`dead: udl …`).' },
];

function indentOf(s: string): number {
  return (/^[ \t]*/.exec(s)![0] ?? '').replace(/\t/g, '    ').length;
}

export function completions(a: NoteAnalysis, pos: Position, settings: ServerSettings, snippets: boolean): CompletionItem[] {
  const bi = blockAt(a, pos.line);
  if (bi < 0) return [];
  const lineText = a.lines[pos.line] ?? '';
  const before = lineText.slice(0, pos.character);
  if (before.includes('#')) return [];
  const block = a.blocks[bi]!;
  const bl = block.lines.find((l) => l.line === pos.line);
  const inBlock = bl ? before.slice(Math.min(bl.column, before.length)) : before;
  const visible = definitionsVisibleAt(a, pos.line);
  const pr = presenter(a, settings);
  const snippet = (label: string, body: string, kind: CompletionItemKind, doc: string, sortText?: string): CompletionItem =>
    snippets
      ? { label, kind, insertText: body, insertTextFormat: InsertTextFormat.Snippet, documentation: doc, sortText }
      : { label, kind, documentation: doc, sortText };

  // Members: `S.` / `B.`
  const member = /([A-Za-z_]\w*)\.(\w*)$/.exec(inBlock);
  if (member) {
    const def = visible.get(member[1]!);
    if (!def) return [];
    const value = a.resultOf.get(def.statement)?.value;
    if (def.kind === 'section') return Object.entries(SECTION_MEMBERS).map(([k, doc]) => ({ label: k, kind: CompletionItemKind.Property, detail: doc, documentation: doc }));
    if (def.kind === 'beam') {
      const items: CompletionItem[] = Object.entries(BEAM_MEMBERS).map(([k, doc]) => ({ label: k, kind: CompletionItemKind.Property, detail: doc }));
      if (value?.kind === 'beam' && !value.combination) for (const c of value.beam.combinationNames) items.push({ label: c, kind: CompletionItemKind.EnumMember, detail: `load combination ${c}` });
      return items;
    }
    return [];
  }

  const units = (): CompletionItem[] =>
    COMMON_UNITS.filter((u) => lookupUnit(u)).map((u, i) => ({ label: u, kind: CompletionItemKind.Unit, sortText: `u${String(i).padStart(2, '0')}` }));

  // Units after a number or after `to`.
  if (/(^|[^\w.])\d[\d_]*(\.\d*)?([eE][+-]?\d+)?\s*[A-Za-z_]?\w*$/.test(inBlock) && !/\s(at|x|to|from)\s*$/.test(inBlock)) {
    if (/\d\s+\w*$/.test(inBlock) || /\d[A-Za-z_]\w*$/.test(inBlock)) return units();
  }
  if (/\bto\s+\w*$/.test(inBlock) && !/^\s*(udl|ramp)\b/.test(inBlock.trimStart()) && /=|check/.test(inBlock)) return units();

  // The first word of a line: what may start a statement here depends on the header above.
  if (/^\s*\w*$/.test(inBlock)) {
    const indent = indentOf(inBlock);
    if (indent > 0) {
      for (let l = pos.line - 1; l > block.fenceLine; l--) {
        const t = a.lines[l] ?? '';
        const bt = block.lines.find((x) => x.line === l)?.text ?? t;
        if (/^\s*(#.*)?$/.test(bt)) continue;
        if (indentOf(bt) >= indent) continue;
        if (/^\s*section\b/.test(bt)) {
          return [
            ...PART_SHAPES.map((s) => snippet(s, PART_SNIPPETS[s] ?? s, CompletionItemKind.Struct, `A ${s} part.`)),
            { label: 'hole', kind: CompletionItemKind.Keyword, documentation: 'Subtracts the part that follows (a bolt hole, an opening).' },
          ];
        }
        if (/^\s*beam\b/.test(bt)) return BEAM_ITEMS.map((b) => snippet(b.label, b.snippet, CompletionItemKind.Keyword, b.doc));
        break;
      }
    }
    const names: CompletionItem[] = [];
    return [...STATEMENTS.map((s) => snippet(s.label, s.snippet, CompletionItemKind.Keyword, s.doc, `0${s.label}`)), ...names];
  }
  if (/^\s*hole\s+\w*$/.test(inBlock)) return PART_SHAPES.filter((s) => s !== 'polygon').map((s) => snippet(s, PART_SNIPPETS[s] ?? s, CompletionItemKind.Struct, `A ${s} hole.`));

  // An expression: names above, functions, units.
  const items: CompletionItem[] = [];
  for (const [name, def] of visible) {
    const res = a.resultOf.get(def.statement);
    items.push({
      label: name,
      kind: def.kind === 'section' ? CompletionItemKind.Struct : def.kind === 'beam' ? CompletionItemKind.Class : CompletionItemKind.Variable,
      detail: res ? lineResult(res, pr) : def.kind,
      sortText: `0${name}`,
    });
  }
  for (const [name, info] of Object.entries(FUNCTIONS)) {
    items.push({
      label: name,
      kind: CompletionItemKind.Function,
      detail: info.signature,
      documentation: info.doc,
      sortText: `1${name}`,
      ...(snippets ? { insertText: `${name}($1)`, insertTextFormat: InsertTextFormat.Snippet, command: { title: 'signature help', command: 'editor.action.triggerParameterHints' } } : {}),
    });
  }
  items.push({ label: 'pi', kind: CompletionItemKind.Constant, detail: '3.14159…', sortText: '2pi' });
  if (/\bshear\([^()]*,[^()]*,\s*\w*$/.test(inBlock)) {
    items.push({ label: 'left', kind: CompletionItemKind.EnumMember, detail: 'the side of x just left of a jump' }, { label: 'right', kind: CompletionItemKind.EnumMember, detail: 'the side of x just right of a jump' });
  }
  return [...items, ...units()];
}

/** Parameter labels of a function signature such as `shear(beam, x[, left | right])`. */
function parameters(signature: string): string[] {
  const inner = signature.slice(signature.indexOf('(') + 1, signature.lastIndexOf(')'));
  return inner
    .replace(/[\[\]]/g, '')
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s.length > 0);
}

export function signatureHelp(a: NoteAnalysis, pos: Position): SignatureHelp | null {
  if (blockAt(a, pos.line) < 0) return null;
  const before = (a.lines[pos.line] ?? '').slice(0, pos.character);
  if (before.includes('#')) return null;
  // Walk back to the innermost unclosed parenthesis, counting commas at its depth.
  let depth = 0;
  let commas = 0;
  for (let i = before.length - 1; i >= 0; i--) {
    const c = before[i]!;
    if (c === ')') depth++;
    else if (c === '(') {
      if (depth === 0) {
        const m = /([A-Za-z_]\w*)\s*$/.exec(before.slice(0, i));
        const name = m?.[1];
        if (!name || !Object.prototype.hasOwnProperty.call(FUNCTIONS, name)) return null;
        const info = FUNCTIONS[name]!;
        const params = parameters(info.signature);
        return {
          signatures: [
            {
              label: info.signature,
              documentation: info.doc,
              parameters: params.map((p) => {
                const start = info.signature.indexOf(p, info.signature.indexOf('('));
                return { label: [start, start + p.length] as [number, number] };
              }),
            },
          ],
          activeSignature: 0,
          activeParameter: Math.min(commas, Math.max(0, params.length - 1)),
        };
      }
      depth--;
    } else if (c === ',' && depth === 0) commas++;
  }
  return null;
}
