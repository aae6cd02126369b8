/**
 * `tauline` command line: check, and the other commands as they land. Exit codes (a contract):
 * 0 all evaluated and every check passes; 1 a check fails, a block has an error, or (with --frozen)
 * a stamp is stale; 2 bad command line or an unreadable file.
 */
import { parseArgs } from 'node:util';
import { runCheck } from './check';

const USAGE = `tauline: beam shear calculations in Markdown

usage:
  tauline check  [PATHS...] [--json] [--frozen] [--format text|json|github] [--jobs N]
  tauline stamp  [PATHS...]
  tauline report [PATHS...] [-o DIR]
  tauline diff   [REV_A] [REV_B] [PATHS...] [--format text|markdown|json]
  tauline lsp --stdio

Folders are searched for .md files. Exit 0: every check passes; 1: a check fails, a block has an
error or a stamp is stale (--frozen); 2: bad command line or unreadable file.`;

export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  // `tauline check | head` closes stdout early: stop quietly instead of crashing.
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(process.exitCode ?? 0);
  });
  const out = (s: string) => process.stdout.write(s);
  const err = (s: string) => process.stderr.write(s);
  try {
    switch (command) {
      case 'check': {
        const { values, positionals } = parseArgs({
          args: rest,
          allowPositionals: true,
          options: { json: { type: 'boolean' }, frozen: { type: 'boolean' }, format: { type: 'string' }, jobs: { type: 'string' } },
        });
        const format = values.json ? 'json' : (values.format ?? 'text');
        if (!['text', 'json', 'github'].includes(format)) {
          err(`tauline: unknown --format ${format} (text, json or github)\n`);
          return 2;
        }
        const jobs = values.jobs === undefined ? undefined : Number(values.jobs);
        if (jobs !== undefined && !(Number.isInteger(jobs) && jobs >= 1 && jobs <= 64)) {
          err(`tauline: --jobs takes a whole number from 1 to 64\n`);
          return 2;
        }
        return await runCheck({ paths: positionals, cwd: process.cwd(), format: format as 'text' | 'json' | 'github', frozen: !!values.frozen, jobs, out, err });
      }
      case 'stamp': {
        const { runStamp } = await import('./stamp');
        return await runStamp(rest, { cwd: process.cwd(), out, err });
      }
      case 'report': {
        const { runReport } = await import('./report');
        return await runReport(rest, { cwd: process.cwd(), out, err });
      }
      case 'diff': {
        const { runDiff } = await import('./diff');
        return await runDiff(rest, { cwd: process.cwd(), out, err });
      }
      case 'lsp': {
        const { startStdioServer } = await import('../server/stdio');
        startStdioServer();
        return -1;
      }
      case undefined:
      case '-h':
      case '--help':
      case 'help':
        out(USAGE + '\n');
        return command === undefined ? 2 : 0;
      default:
        err(`tauline: unknown command "${command}"\n\n${USAGE}\n`);
        return 2;
    }
  } catch (e) {
    err(`tauline: ${e instanceof Error ? e.message : String(e)}\n`);
    return 2;
  }
}
