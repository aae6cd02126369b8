/**
 * A lens over each `shear` block: its checks' summary, which opens the calculation sheet
 * (the client's `tauline.openReport` command, given the note's URI and the block's fence line).
 */
import type { CodeLens } from 'vscode-languageserver';
import type { NoteAnalysis } from '../analysis';
import { ratioText } from '../present';

export const OPEN_REPORT_COMMAND = 'tauline.openReport';

export function codeLenses(a: NoteAnalysis): CodeLens[] {
  return a.blocks.map((block, i) => {
    const br = a.note?.blocks[i];
    let title: string;
    if (!br) title = 'Not evaluated (untrusted workspace)';
    else {
      const errors = br.diagnostics.filter((d) => d.severity === 'error').length;
      const checks = br.checks;
      const failed = checks.filter((c) => !c.pass).length;
      const parts: string[] = [];
      if (checks.length === 0) parts.push('no checks');
      else if (failed === 0) parts.push(`${checks.length === 1 ? 'check passes' : `all ${checks.length} checks pass`}`);
      else parts.push(`${failed} of ${checks.length} check${checks.length === 1 ? '' : 's'} FAIL`);
      if (checks.length) parts.push(`max utilisation ${ratioText(Math.max(...checks.map((c) => c.ratio)))}`);
      if (errors) parts.push(`${errors} error${errors === 1 ? '' : 's'}`);
      title = parts.join(' · ');
    }
    const line = block.fenceLine;
    return {
      range: { start: { line, character: 0 }, end: { line, character: 0 } },
      command: { title: `${title} — open calculation sheet`, command: OPEN_REPORT_COMMAND, arguments: [a.uri, line] },
    };
  });
}
