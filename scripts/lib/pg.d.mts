// Types for the cluster helpers in pg.mjs, for the TypeScript tests that start a cluster of their own.
export class FriendlyError extends Error {}
export function findPgBin(options?: { install?: boolean }): { version: string; bin: string };
export function portIsFree(port: number, host?: string): Promise<boolean>;
export function freePort(): Promise<number>;
export function startCluster(options: {
  dataDir: string;
  port: number;
  database: string;
  durable?: boolean;
  quiet?: boolean;
}): Promise<{ url: string; stop: () => void; logFile: string }>;
export function removeDir(dir: string): void;
export function useLocalCluster(options: {
  dataDir: string;
  port: number;
  database: string;
}): Promise<{ url: string; stop: () => void; alreadyRunning: boolean }>;
export function databaseUrlOrLocalCluster(
  root: string,
): Promise<{ url: string; cluster: { url: string; stop: () => void; alreadyRunning: boolean } | null }>;
export function startThrowawayCluster(options: {
  prefix: string;
  database: string;
}): Promise<{ cluster: { url: string; stop: () => void; logFile: string }; tempDir: string }>;
