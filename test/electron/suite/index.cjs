// Runs inside VS Code's extension host (loaded by @vscode/test-electron's runTests). Plain CommonJS
// with no test framework, so it needs no build step: run() rejects on the first failed expectation.
const assert = require('node:assert/strict');
const path = require('node:path');
const vscode = require('vscode');

async function waitFor(what, fn, timeoutMs = 60000) {
  const end = Date.now() + timeoutMs;
  let last;
  while (Date.now() < end) {
    try {
      const v = await fn();
      if (v) return v;
    } catch (e) {
      last = e;
    }
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error(`timed out waiting for ${what}${last ? `: ${last.message}` : ''}`);
}

async function run() {
  const folder = vscode.workspace.workspaceFolders?.[0]?.uri.fsPath;
  assert.ok(folder, 'the test opens the demo notes folder');
  const uri = vscode.Uri.file(path.join(folder, 'mezzanine-girder.md'));
  const doc = await vscode.workspace.openTextDocument(uri);
  await vscode.window.showTextDocument(doc);
  const lines = doc.getText().split(/\r?\n/);
  const sectionLine = lines.findIndex((l) => /^section G2\b/.test(l));
  assert.ok(sectionLine >= 0);

  // Results at line ends.
  const hints = await waitFor('inlay hints', async () => {
    const h = await vscode.commands.executeCommand('vscode.executeInlayHintProvider', uri, new vscode.Range(0, 0, doc.lineCount, 0));
    return h && h.length ? h : undefined;
  });
  const labels = hints.map((h) => (typeof h.label === 'string' ? h.label : h.label.map((p) => p.value).join('')));
  assert.ok(labels.some((l) => /^= .* kN$/.test(l)), `a force result among ${labels.join(' | ')}`);

  // A hover with the section picture.
  const hovers = await waitFor('a section hover', async () => {
    const h = await vscode.commands.executeCommand('vscode.executeHoverProvider', uri, new vscode.Position(sectionLine, lines[sectionLine].indexOf('G2') + 1));
    return h && h.length ? h : undefined;
  });
  const text = hovers.flatMap((h) => h.contents.map((c) => (typeof c === 'string' ? c : c.value))).join('\n');
  assert.match(text, /section G2/);
  assert.match(text, /data:image\/svg\+xml;base64,/);

  // A failing check is a warning with its utilisation.
  const edit = new vscode.WorkspaceEdit();
  const allowLine = lines.findIndex((l) => /^tau_allow\s*=/.test(l));
  edit.replace(uri, new vscode.Range(allowLine, 0, allowLine, lines[allowLine].length), 'tau_allow = 12 MPa');
  await vscode.workspace.applyEdit(edit);
  const diags = await waitFor('a failing-check diagnostic', () => vscode.languages.getDiagnostics(uri).filter((d) => d.code === 'check.fails' || (d.code && d.code.value === 'check.fails')));
  assert.equal(diags[0].severity, vscode.DiagnosticSeverity.Warning);
  assert.match(diags[0].message, /utilisation/);
  await vscode.commands.executeCommand('workbench.action.revertFile');
}

module.exports = { run };
