/**
 * Real server processes for the scale-out tests: `api/server.ts` started as `npm start` starts it,
 * on a free loopback port, against the test database.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

export interface Instance {
  url: string;
  port: number;
  child: ChildProcess;
  /** Everything the process wrote, for failure messages. */
  output: () => string;
  exited: Promise<number | null>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

/** Start one instance; resolves when it listens. */
export async function startInstance(env: Record<string, string>): Promise<Instance> {
  const port = await freePort();
  let out = '';
  const child = spawn(process.execPath, ['--import', 'tsx', 'api/server.ts'], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: 'development',
      PORT: String(port),
      HOST: '127.0.0.1',
      LOG_LEVEL: 'warn',
      EYRIE_DEV_TOOLS: '1',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe', 'ipc'],
  });
  child.stdout!.on('data', (d) => (out += String(d)));
  child.stderr!.on('data', (d) => (out += String(d)));
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`instance on ${port} did not start:\n${out}`)), 60_000);
    child.on('message', (m: { type?: string }) => {
      if (m?.type === 'ready') {
        clearTimeout(timer);
        resolve();
      }
    });
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`instance on ${port} exited with ${code}:\n${out}`));
    });
  });
  return { url: `http://127.0.0.1:${port}`, port, child, output: () => out, exited };
}

/** Stop an instance politely (SIGTERM), or for good after `graceMs`. */
export async function stopInstance(instance: Instance, graceMs = 15_000): Promise<number | null> {
  if (instance.child.exitCode !== null || instance.child.signalCode !== null) return instance.child.exitCode;
  instance.child.kill('SIGTERM');
  const timer = setTimeout(() => instance.child.kill('SIGKILL'), graceMs);
  const code = await instance.exited;
  clearTimeout(timer);
  return code;
}
