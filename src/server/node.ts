/**
 * Node entry of the language server (bundled to dist/server.js). The transport comes from the
 * command line the client starts it with: `--node-ipc` (the VS Code extension), `--stdio`, or
 * `--socket=PORT`; vscode-languageserver reads those arguments itself.
 */
import { createConnection, ProposedFeatures } from 'vscode-languageserver/node';
import { startServer } from './server';

startServer(createConnection(ProposedFeatures.all));
