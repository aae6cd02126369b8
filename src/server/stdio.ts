/**
 * `tauline lsp --stdio`: the server over standard input and output, for any LSP editor. Nothing
 * else may write to stdout here (console output is routed to the client's log by the connection).
 */
import { createConnection, ProposedFeatures, StreamMessageReader, StreamMessageWriter } from 'vscode-languageserver/node';
import { startServer } from './server';

export function startStdioServer(input: NodeJS.ReadableStream = process.stdin, output: NodeJS.WritableStream = process.stdout): void {
  const connection = createConnection(ProposedFeatures.all, new StreamMessageReader(input), new StreamMessageWriter(output));
  startServer(connection);
}
