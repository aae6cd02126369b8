/**
 * Browser entry: the server inside a web worker (bundled to dist/browser/server.js), started by the
 * extension's browser entry for the browser-based VS Code. Same features; messages go over postMessage.
 */
import { BrowserMessageReader, BrowserMessageWriter, createConnection } from 'vscode-languageserver/browser';
import { startServer } from './server';

declare const self: unknown;

const scope = self as ConstructorParameters<typeof BrowserMessageReader>[0];
startServer(createConnection(new BrowserMessageReader(scope), new BrowserMessageWriter(scope)));
