// Types of code-server.mjs (plain ESM so scripts/start.mjs can use it without a build step).
import type { ChildProcess } from 'node:child_process';

export const CODE_SERVER_VERSION: string;
export const NODE24_VERSION: string;
export interface E2EPaths {
  e2e: string;
  node24Dir: string;
  nodeBin: string;
  node: string;
  nodeHeaders: string;
  csDir: string;
  entry: string;
}
export function cacheDir(root: string): string;
export function paths(root: string): E2EPaths;
export function registryReachable(): boolean;
export function ensureCodeServer(root: string, log?: (line: string) => void): E2EPaths;
export function freePort(): Promise<number>;
export function linkExtension(root: string, extensionsDir: string): string;
export interface RunningCodeServer {
  url: string;
  port: number;
  child: ChildProcess;
  runDir: string;
  stop(): void;
  output(): string;
}
export function startCodeServer(
  root: string,
  options: { workspace: string; runDir: string; port?: number; trusted?: boolean; settings?: Record<string, unknown>; log?: (s: string) => void },
): Promise<RunningCodeServer>;
export function scratchWorkspace(from: string, to: string): string;
