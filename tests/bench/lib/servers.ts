import { fork, type ChildProcess } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));

export interface RunningServer {
  name: string;
  url: string;
  stop(): Promise<void>;
}

/**
 * Starts one of the bench's servers (tests/bench/servers/<file>) in its own Node process, so
 * the load generator in this process never shares an event loop with the server it measures.
 * The child sends `{ port }` once it listens.
 */
export function startServer(name: string, file: string, env: Record<string, string>): Promise<RunningServer> {
  const child: ChildProcess = fork(join(here, '../servers', file), [], {
    // BENCH_PROFILE=<dir> writes a V8 CPU profile of each server to that folder on exit.
    execArgv: ['--import', 'tsx', ...(process.env.BENCH_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_PROFILE}/${name}`] : [])],
    env: { ...process.env, NODE_ENV: 'production', ...env },
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`${name} did not start within 60 s`));
    }, 60_000);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`${name} exited before listening (status ${code})`));
    });
    child.once('message', (m: unknown) => {
      clearTimeout(timer);
      const port = (m as { port?: number }).port;
      if (!port) return reject(new Error(`${name} sent no port`));
      resolve({
        name,
        url: `http://127.0.0.1:${port}`,
        stop: () =>
          new Promise<void>((done) => {
            if (child.exitCode !== null) return done();
            child.removeAllListeners('exit');
            child.once('exit', () => done());
            child.kill('SIGTERM');
            setTimeout(() => child.kill('SIGKILL'), 5_000).unref();
          }),
      });
    });
  });
}
