/**
 * The real server (dist/server.js, and `tauline lsp --stdio`) driven over stdio by a real
 * JSON-RPC client. Reference values are closed forms worked by hand beside each check:
 * a welded I-girder (two 250 × 16 mm flanges on a 10 × 520 mm web) and a simply supported beam.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CompletionItem, DocumentSymbol, Hover, InlayHint, Location, SignatureHelp, CodeLens, CodeAction, TextEdit } from 'vscode-languageserver-protocol';
import { ensureBuilt, ROOT, startClient, type TestClient } from './lsp-client';

const NOTE = [
  '# Girder G9 (test note)', // 0
  '', // 1
  '```shear Section', // 2
  'section G9: welded plate girder', // 3
  '  plate 250 mm x 16 mm', // 4
  '  plate 10 mm x 520 mm', // 5
  '  plate 250 mm x 16 mm', // 6
  '', // 7
  'y_joint = G9.depth - 16 mm', // 8
  '```', // 9
  '', // 10
  '```shear Design shear', // 11
  'beam B9: 7.2 m', // 12
  '  pin at 0 m', // 13
  '  roller at 7.2 m', // 14
  '  udl 14.5 kN/m', // 15
  '  point 36 kN at 1.2 m', // 16
  '', // 17
  'V = B9.Vmax', // 18
  '```', // 19
  '', // 20
  '```shear Stresses', // 21
  't_max = tau_max(G9, V)', // 22
  'q_joint = flow(G9, V, y_joint)', // 23
  'tau_allow = 0.4 * 275 MPa', // 24
  'check t_max <= tau_allow', // 25
  '```', // 26
  '',
].join('\n');

const URI = 'file:///virtual/girder-g9.md';

function lineText(n: number): string {
  return NOTE.split('\n')[n]!;
}

function at(line: number, word: string, offset = 1) {
  const i = lineText(line).indexOf(word);
  if (i < 0) throw new Error(`"${word}" not on line ${line}`);
  return { line, character: i + offset };
}

function decodeImages(markdown: string): string[] {
  return [...markdown.matchAll(/!\[[^\]]*\]\(data:image\/svg\+xml;base64,([A-Za-z0-9+/=]+)\)/g)].map((m) => Buffer.from(m[1]!, 'base64').toString('utf8'));
}

describe('language server over stdio', () => {
  let c: TestClient;

  beforeAll(async () => {
    ensureBuilt();
    c = startClient();
    const init = await c.initialize({ diagnosticsDelayMs: 0, themeKind: 'dark' });
    expect(init.capabilities.hoverProvider).toBe(true);
    expect(init.capabilities.inlayHintProvider).toBeTruthy();
    expect(init.capabilities.completionProvider?.triggerCharacters).toContain('.');
    c.open(URI, NOTE, 1);
  });

  afterAll(async () => {
    await c?.stop();
  });

  it('publishes no diagnostics for a sound note', async () => {
    const d = await c.diagnostics(URI, 1);
    expect(d).toEqual([]);
  });

  it('hovers a section with its properties and a data-URI picture', async () => {
    const h = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(3, 'G9') });
    const md = (h.contents as { value: string }).value;
    // closed form: I = (B·D³ − (B − t_w)·d³)/12 = (250·552³ − 240·520³)/12 = 691.9×10⁶ mm⁴
    expect(md).toContain('| I | 692×10⁶ mm⁴ |');
    // closed form: A = 2·250·16 + 10·520 = 13 200 mm²; yc = 552/2 (symmetric)
    expect(md).toContain('| A | 13200 mm² |');
    expect(md).toMatch(/\| yc [^|]*\| 276 mm \|/);
    // closed form: Q at the NA = 250·16·(276 − 8) + 10·260·130 = 1.41×10⁶ mm³
    expect(md).toContain('| Q at the neutral axis | 1.41×10⁶ mm³ |');
    const images = decodeImages(md);
    expect(images.length).toBe(1);
    const svg = images[0]!;
    expect(svg).toMatch(/^<svg[^>]* width="\d+(\.\d+)?" height="\d+(\.\d+)?"/);
    expect(svg).not.toMatch(/<script|on\w+=/i);
    expect(md.length).toBeLessThan(100_000);
    // tau_max marked on the diagram
    expect(svg).toMatch(/τmax/);
  });

  it('hovers a quantity with its formula and values substituted', async () => {
    const h = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(22, 't_max') });
    const md = (h.contents as { value: string }).value;
    // statics of the simple beam: R_left = 14.5·7.2/2 + 36·6.0/7.2 = 52.2 + 30 = 82.2 kN = Vmax
    expect(md).toContain('t_max = tau_max(G9, V)');
    expect(md).toContain('= tau_max(G9, 82.2 kN)');
    // closed form: tau_max = V·Q/(I·t) = 82.2e3·1.41e6/(691.9e6·10) = 16.8 MPa
    expect(md).toContain('**t_max** = 16.8 MPa');
  });

  it('hovers a tau_max call with a sparkline, a check with its ratio bar and cautions, a beam with V(x) and M(x)', async () => {
    const call = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(22, 'tau_max') });
    const callMd = (call.contents as { value: string }).value;
    expect(decodeImages(callMd).length).toBe(1);
    expect(callMd).toContain('16.8 MPa');
    const check = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(25, 'check') });
    const checkMd = (check.contents as { value: string }).value;
    // 16.8 / 110 = 0.153
    expect(checkMd).toContain('utilisation 0.15');
    expect(checkMd).toMatch(/licensed engineer/);
    expect(decodeImages(checkMd).length).toBe(1);
    const beam = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(12, 'B9') });
    const beamMd = (beam.contents as { value: string }).value;
    expect(decodeImages(beamMd).length).toBe(1);
    // statics: R_right = 14.5·7.2 + 36 − 82.2 = 58.2 kN
    expect(beamMd).toContain('58.2 kN');
  });

  it('gives each line its result as an inlay hint', async () => {
    const hints = await c.request<InlayHint[]>('textDocument/inlayHint', { textDocument: { uri: URI }, range: { start: { line: 0, character: 0 }, end: { line: 30, character: 0 } } });
    const byLine = new Map(hints.map((h) => [h.position.line, String(h.label)]));
    expect(byLine.get(18)).toBe('= 82.2 kN');
    expect(byLine.get(8)).toBe('= 536 mm');
    expect(byLine.get(25)).toBe('pass 0.15');
    expect(hints.find((h) => h.position.line === 18)!.position.character).toBe(lineText(18).length);
  });

  it('puts a code lens over each block that opens the calculation sheet', async () => {
    const lenses = await c.request<CodeLens[]>('textDocument/codeLens', { textDocument: { uri: URI } });
    expect(lenses.map((l) => l.range.start.line)).toEqual([2, 11, 21]);
    expect(lenses.every((l) => l.command?.command === 'tauline.openReport')).toBe(true);
    expect(lenses[2]!.command!.title).toMatch(/check passes · max utilisation 0\.15/);
  });

  it('completes keywords, parts, members, names, functions and units', async () => {
    const complete = (line: number, character: number) => c.request<CompletionItem[]>('textDocument/completion', { textDocument: { uri: URI }, position: { line, character } });
    const labels = (items: CompletionItem[]) => items.map((i) => i.label);
    // A blank line in a block: statement keywords.
    expect(labels(await complete(17, 0))).toEqual(expect.arrayContaining(['section', 'beam', 'check', 'units']));
    // Indented under the section: part shapes.
    c.change(URI, 2, [{ range: { start: { line: 7, character: 0 }, end: { line: 7, character: 0 } }, text: '  ' }]);
    expect(labels(await complete(7, 2))).toEqual(expect.arrayContaining(['plate', 'isection', 'circle', 'hole']));
    c.change(URI, 3, [{ range: { start: { line: 7, character: 0 }, end: { line: 7, character: 2 } }, text: '' }]);
    // Members after `G9.` (line 8 is `y_joint = G9.depth - 16 mm`: cursor after the dot).
    const members = labels(await complete(8, lineText(8).indexOf('G9.') + 3));
    expect(members).toEqual(expect.arrayContaining(['A', 'I', 'yc', 'depth']));
    // An expression: names defined above, functions, units.
    const expr = labels(await complete(22, lineText(22).indexOf('(') + 1));
    expect(expr).toEqual(expect.arrayContaining(['G9', 'V', 'y_joint', 'tau', 'flow', 'kN', 'MPa']));
    expect(expr).not.toContain('t_max'); // defined on this very line, not above it
    // After a number: units first.
    c.change(URI, 4, [{ range: { start: { line: 24, character: 0 }, end: { line: 24, character: lineText(24).length } }, text: 'tau_allow = 110 ' }]);
    expect(labels(await complete(24, 'tau_allow = 110 '.length))).toEqual(expect.arrayContaining(['MPa', 'ksi']));
    c.change(URI, 5, [{ range: { start: { line: 24, character: 0 }, end: { line: 24, character: 'tau_allow = 110 '.length } }, text: lineText(24) }]);
  });

  it('gives signature help inside a call', async () => {
    const help = await c.request<SignatureHelp>('textDocument/signatureHelp', { textDocument: { uri: URI }, position: { line: 23, character: lineText(23).indexOf('V,') + 1 } });
    expect(help.signatures[0]!.label).toBe('flow(section, V, y)');
    expect(help.activeParameter).toBe(1);
  });

  it('goes to definitions and finds references across blocks', async () => {
    const def = await c.request<Location>('textDocument/definition', { textDocument: { uri: URI }, position: at(22, 'V)') });
    expect(def.range.start).toEqual({ line: 18, character: 0 });
    const refs = await c.request<Location[]>('textDocument/references', { textDocument: { uri: URI }, position: at(3, 'G9'), context: { includeDeclaration: true } });
    expect(refs.map((r) => r.range.start.line).sort((a, b) => a - b)).toEqual([3, 8, 22, 23]);
  });

  it('lists sections, beams and checks as document symbols', async () => {
    const symbols = await c.request<DocumentSymbol[]>('textDocument/documentSymbol', { textDocument: { uri: URI } });
    expect(symbols.map((s) => s.name)).toEqual(['Section', 'Design shear', 'Stresses']);
    const names = symbols.flatMap((s) => (s.children ?? []).map((ch) => ch.name));
    expect(names).toEqual(expect.arrayContaining(['G9', 'B9', 'check t_max <= tau_allow']));
  });

  it('re-evaluates after an edit and reports units, names and failing checks', async () => {
    // Double the line load: R_left = 29·3.6 + 30 = 134.4 kN.
    c.change(URI, 6, [{ range: { start: { line: 15, character: 6 }, end: { line: 15, character: 10 } }, text: '29' }]);
    expect(await c.diagnostics(URI, 6)).toEqual([]);
    const hints = await c.request<InlayHint[]>('textDocument/inlayHint', { textDocument: { uri: URI }, range: { start: { line: 18, character: 0 }, end: { line: 18, character: 99 } } });
    expect(hints.map((h) => h.label)).toEqual(['= 134 kN']);
    // A unit error, an undefined name and a failing check in one edit.
    c.change(URI, 7, [
      { range: { start: { line: 24, character: 0 }, end: { line: 24, character: lineText(24).length } }, text: 'tau_allow = 20 MPa' },
      { range: { start: { line: 18, character: 0 }, end: { line: 18, character: lineText(18).length } }, text: 'V = B9.Vmax + 3 mm' },
    ]);
    let d = await c.diagnostics(URI, 7);
    expect(d.find((x) => x.code === 'unit.mismatch')).toMatchObject({ severity: 1, source: 'tauline', range: { start: { line: 18 } } });
    c.change(URI, 8, [{ range: { start: { line: 18, character: 0 }, end: { line: 18, character: 'V = B9.Vmax + 3 mm'.length } }, text: 'V = B9.Vmax' }]);
    d = await c.diagnostics(URI, 8);
    // 134.4 kN → tau_max = 16.8·134.4/82.2 = 27.5 MPa > 20 MPa: a warning with the utilisation
    const fail = d.find((x) => x.code === 'check.fails')!;
    expect(fail).toMatchObject({ severity: 2, source: 'tauline', range: { start: { line: 25 } } });
    expect(fail.message).toMatch(/utilisation 1\.37/);
    c.change(URI, 9, [{ range: { start: { line: 22, character: 0 }, end: { line: 22, character: lineText(22).length } }, text: 't_max = tau_max(G9, V_typo)' }]);
    d = await c.diagnostics(URI, 9);
    expect(d.find((x) => x.code === 'name.undefined')).toMatchObject({ range: { start: { line: 22 } } });
  });

  it('publishes only the newest version when edits arrive faster than evaluation', async () => {
    const text = NOTE;
    const uri = 'file:///virtual/burst.md';
    c.open(uri, text, 1);
    await c.diagnostics(uri, 1);
    for (let v = 2; v <= 30; v++) c.change(uri, v, [{ range: { start: { line: 24, character: 12 }, end: { line: 24, character: 15 } }, text: v % 2 ? '0.4' : '0.1' }]);
    const d = await c.diagnostics(uri, 30);
    expect(c.lastDiagnostics(uri)!.version).toBe(30);
    // v30 is even: 0.1·275 = 27.5 MPa allowable against 16.8 MPa: passes
    expect(d).toEqual([]);
  });

  it('stamps results and flags a stale stamp with a quick fix', async () => {
    const uri = 'file:///virtual/stamped.md';
    c.open(uri, NOTE, 1);
    await c.diagnostics(uri, 1);
    const out = await c.request<{ edits: TextEdit[]; problems: string[]; version: number }>('tauline/stampEdits', { uri });
    expect(out.problems).toEqual([]);
    expect(out.edits.length).toBe(3);
    // Apply the edits (from the end, so earlier positions stay valid).
    const lines = NOTE.split('\n');
    const offset = (p: { line: number; character: number }) => lines.slice(0, p.line).reduce((n, l) => n + l.length + 1, 0) + p.character;
    let stamped = NOTE;
    for (const e of [...out.edits].sort((a, b) => offset(b.range.start) - offset(a.range.start))) {
      stamped = stamped.slice(0, offset(e.range.start)) + e.newText + stamped.slice(offset(e.range.end));
    }
    expect(stamped).toContain('tauline-results');
    c.change(uri, 2, [{ text: stamped }]);
    expect((await c.diagnostics(uri, 2)).filter((d) => d.code === 'stamp.stale')).toEqual([]);
    // Change the load: the design-shear and stresses stamps go stale.
    const changed = stamped.replace('udl 14.5 kN/m', 'udl 16 kN/m');
    c.change(uri, 3, [{ text: changed }]);
    const stale = (await c.diagnostics(uri, 3)).filter((d) => d.code === 'stamp.stale');
    expect(stale.length).toBe(2);
    expect(stale[0]!.message).toMatch(/82\.2 kN → 87\.6 kN/); // 16·3.6 + 30 = 87.6 kN
    const actions = await c.request<CodeAction[]>('textDocument/codeAction', { textDocument: { uri }, range: stale[0]!.range, context: { diagnostics: [stale[0]] } });
    expect(actions[0]).toMatchObject({ kind: 'quickfix', isPreferred: true });
    expect(Object.values(actions[0]!.edit!.changes!)[0]!.length).toBeGreaterThan(0);
  });

  it('survives a malformed note', async () => {
    const uri = 'file:///virtual/malformed.md';
    const junk = [
      '```shear',
      'section : : :',
      '  plate x x x at at',
      'beam B: -1 m',
      '  udl kN/m from to',
      'check <= <=',
      'x = ((((((((((1',
      `y = ${'1+'.repeat(3000)}1`,
      'z = 1e309 kN',
      'w = 1 / 0',
      'u = \u0000\u202e\ud800 bad',
      'v = tau(Q, Q, Q)',
      '~~~shear nested',
      '```shear',
      '   ```',
      'no closing fence here',
    ].join('\n');
    c.open(uri, junk, 1);
    const d = await c.diagnostics(uri, 1);
    expect(d.length).toBeGreaterThan(5);
    expect(d.every((x) => x.source === 'tauline' && typeof x.code === 'string')).toBe(true);
    for (let line = 0; line < 16; line++) {
      await c.request('textDocument/hover', { textDocument: { uri }, position: { line, character: 3 } });
      await c.request('textDocument/completion', { textDocument: { uri }, position: { line, character: 5 } });
    }
    await c.request('textDocument/documentSymbol', { textDocument: { uri } });
    // Still answering the sound note.
    const h = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(3, 'G9') });
    expect((h.contents as { value: string }).value).toContain('section G9');
  });

  it('evaluates a note of 10 000 lines without stalling, and keeps answering', async () => {
    const uri = 'file:///virtual/long.md';
    const parts: string[] = [];
    for (let b = 0; parts.length < 10_000; b++) {
      parts.push(`## Block ${b}`, '', `\`\`\`shear Beam ${b}`, `section S${b}`, `  plate ${100 + (b % 7)} mm x ${300 + b} mm`, `beam B${b}: ${4 + (b % 5)} m`, '  pin at 0 m', `  roller at ${4 + (b % 5)} m`, `  udl ${10 + (b % 9)} kN/m`, `V${b} = B${b}.Vmax`, `t${b} = tau_max(S${b}, V${b})`, `check t${b} <= 2 MPa`, '```', '');
    }
    const text = parts.slice(0, 10_000).join('\n');
    expect(text.split('\n').length).toBe(10_000);
    c.open(uri, text, 1);
    const d = await c.diagnostics(uri, 1, 120_000);
    expect(Array.isArray(d)).toBe(true);
    const h = await c.request<Hover>('textDocument/hover', { textDocument: { uri }, position: { line: 3, character: 9 } });
    expect((h.contents as { value: string }).value).toContain('section S0');
    // An edit deep in the note comes back too.
    c.change(uri, 2, [{ range: { start: { line: 8, character: 6 }, end: { line: 8, character: 8 } }, text: '99' }]);
    await c.diagnostics(uri, 2, 120_000);
    const stats = await c.request<{ reused: number; blocks: number }>('tauline/evaluationStats', { uri });
    expect(stats.reused).toBe(stats.blocks - 1);
  });
});

describe('`tauline lsp --stdio` (the CLI entry)', () => {
  it('serves diagnostics and hovers like the bundled server', async () => {
    ensureBuilt();
    const c = startClient([process.execPath, `${ROOT}/bin/tauline.js`, 'lsp', '--stdio']);
    try {
      await c.initialize({ diagnosticsDelayMs: 0 });
      c.open(URI, NOTE.replace('0.4 * 275 MPa', '10 MPa'), 1);
      const d = await c.diagnostics(URI, 1);
      expect(d.map((x) => x.code)).toEqual(['check.fails']);
      const h = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(18, 'V') });
      expect((h.contents as { value: string }).value).toContain('82.2 kN');
    } finally {
      await c.stop();
    }
  });
});

describe('restricted mode without evaluation', () => {
  it('reports syntax problems only and evaluates nothing', async () => {
    ensureBuilt();
    const c = startClient();
    try {
      await c.initialize({ diagnosticsDelayMs: 0, evaluate: false });
      c.open(URI, NOTE.replace('check t_max <= tau_allow', 'check t_max <== tau_allow').replace('0.4 * 275 MPa', '1 MPa'), 1);
      const d = await c.diagnostics(URI, 1);
      expect(d.length).toBe(1);
      expect(d[0]!.range.start.line).toBe(25);
      const hints = await c.request<InlayHint[]>('textDocument/inlayHint', { textDocument: { uri: URI }, range: { start: { line: 0, character: 0 }, end: { line: 30, character: 0 } } });
      expect(hints).toEqual([]);
      const h = await c.request<Hover>('textDocument/hover', { textDocument: { uri: URI }, position: at(18, 'V') });
      expect((h.contents as { value: string }).value).toMatch(/Not evaluated/);
      // Navigation works from the parse alone.
      const def = await c.request<Location>('textDocument/definition', { textDocument: { uri: URI }, position: at(22, 'V)') });
      expect(def.range.start.line).toBe(18);
      // Trust granted: the client turns evaluation on.
      await c.connection.sendNotification('workspace/didChangeConfiguration', { settings: { tauline: { evaluate: true } } });
      const after = await c.nextDiagnostics(URI);
      expect(after.map((x) => x.code)).toEqual(['syntax.unexpected']);
      const evaluated = await c.request<InlayHint[]>('textDocument/inlayHint', { textDocument: { uri: URI }, range: { start: { line: 0, character: 0 }, end: { line: 30, character: 0 } } });
      expect(evaluated.find((x) => x.position.line === 18)?.label).toBe('= 82.2 kN');
    } finally {
      await c.stop();
    }
  });
});
