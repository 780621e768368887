import { spawn } from 'node:child_process';
import { once } from 'node:events';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const mainPath = fileURLToPath(new URL('./main.ts', import.meta.url));

describe('payments fake start command', () => {
  it('prints its URL, answers health checks with the configured key, and exits 0 on SIGTERM', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', mainPath], {
      env: { ...process.env, PAYMENTS_FAKE_PORT: '0', PAYMENTS_SECRET_KEY: 'sk_test_main_cmd' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    child.stdout.setEncoding('utf8');
    const url = await new Promise<string>((resolve, reject) => {
      child.stdout.on('data', (chunk: string) => {
        output += chunk;
        const match = /listening on (http:\/\/\S+)/.exec(output);
        if (match) resolve(match[1]);
      });
      child.once('exit', (code) => reject(new Error(`exited early with ${code}: ${output}`)));
    });

    try {
      expect((await fetch(`${url}/_fake/health`)).status).toBe(200);
      const authed = await fetch(`${url}/v1/events`, { headers: { authorization: 'Bearer sk_test_main_cmd' } });
      expect(authed.status).toBe(200);
    } catch (error) {
      child.kill('SIGKILL');
      throw error;
    }

    child.kill('SIGTERM');
    const [code] = await once(child, 'exit');
    expect(code).toBe(0);
  }, 30_000);

  it('refuses a port that is not a number, with a message naming the variable', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', mainPath], {
      env: { ...process.env, PAYMENTS_FAKE_PORT: 'forty' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let errors = '';
    child.stderr.setEncoding('utf8');
    child.stderr.on('data', (chunk: string) => (errors += chunk));
    const [code] = await once(child, 'exit');
    expect(code).toBe(1);
    expect(errors).toMatch(/PAYMENTS_FAKE_PORT must be a port number/);
  }, 30_000);
});
