import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { transpileDurableModules } from './child-modules.ts';
import { acquireRunLock, currentBootId, readRunLock, RUN_LOCK_FILE, RunLockError } from '../../../run/durable/lock.ts';

let directory: string;
beforeEach(() => {
  directory = mkdtempSync(join(tmpdir(), 'coilfront-lock-'));
});
afterEach(() => {
  rmSync(directory, { recursive: true, force: true });
});

/** A pid that was alive a moment ago and is not now: a child process that has exited. */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(child.stdout);
}

function writeLock(holder: object): void {
  writeFileSync(join(directory, RUN_LOCK_FILE), `${JSON.stringify(holder)}\n`);
}

describe('acquireRunLock(directory)', () => {
  it('writes pid, host and boot id, and leaves only the lock file', () => {
    const lock = acquireRunLock(join(directory, 'night'));
    expect(readRunLock(join(directory, 'night'))).toEqual(lock.holder);
    expect(lock.holder).toMatchObject({ pid: process.pid, hostname: hostname(), bootId: currentBootId() });
    expect(lock.tookOverFrom).toBeNull();
    expect(readdirSync(join(directory, 'night'))).toEqual([RUN_LOCK_FILE]);
    lock.release();
    expect(readdirSync(join(directory, 'night'))).toEqual([]);
    lock.release();
  });

  it('refuses a directory locked by a live process, naming it', () => {
    const lock = acquireRunLock(directory);
    let caught: unknown;
    try {
      acquireRunLock(directory);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(RunLockError);
    const message = (caught as Error).message;
    expect(message).toMatch(
      new RegExp(`^'${directory}' is in use by process ${process.pid} since \\d{4}-\\d\\d-\\d\\dT`),
    );
    expect(message).toContain(`delete '${join(directory, RUN_LOCK_FILE)}'`);
    expect(message).not.toContain('\n');
    lock.release();
    acquireRunLock(directory).release();
  });

  it('takes over a stale lock whose process is gone', () => {
    const stale = {
      pid: deadPid(),
      hostname: hostname(),
      bootId: currentBootId(),
      startedAt: '2026-01-01T00:00:00.000Z',
      token: 'old',
    };
    writeLock(stale);
    const lock = acquireRunLock(directory);
    expect(lock.tookOverFrom).toEqual(stale);
    expect(readRunLock(directory)?.token).toBe(lock.holder.token);
    expect(readdirSync(directory)).toEqual([RUN_LOCK_FILE]);
    lock.release();
  });

  it('takes over a lock from before a reboot even if its pid is alive again', () => {
    writeLock({ pid: process.pid, hostname: hostname(), bootId: 'another-boot', startedAt: 'x', token: 'old' });
    const lock = acquireRunLock(directory, { bootId: 'this-boot' });
    expect(lock.tookOverFrom?.bootId).toBe('another-boot');
    lock.release();
  });

  it('refuses a lock of another host, and an unreadable lock', () => {
    writeLock({ pid: 1, hostname: 'cluster-node-17', bootId: null, startedAt: '2026-01-01T00:00:00.000Z', token: 'x' });
    expect(() => acquireRunLock(directory)).toThrow(
      /is in use by process 1 on host cluster-node-17 since 2026-01-01T00:00:00.000Z/,
    );
    writeFileSync(join(directory, RUN_LOCK_FILE), '{"pid": 12');
    expect(() => acquireRunLock(directory)).toThrow(/holds a lock file that cannot be read/);
    expect(readdirSync(directory)).toEqual([RUN_LOCK_FILE]);
  });

  it('does not remove a lock that another process took over meanwhile', () => {
    const lock = acquireRunLock(directory, { isProcessAlive: () => true });
    const successor = acquireRunLock(directory, { isProcessAlive: () => false });
    lock.release();
    expect(readRunLock(directory)?.token).toBe(successor.holder.token);
    successor.release();
    expect(existsSync(join(directory, RUN_LOCK_FILE))).toBe(false);
  });

  it('waits for a live takeover guard and names a guard left by a dead process', () => {
    const stale = { pid: deadPid(), hostname: hostname(), bootId: currentBootId(), startedAt: 'x', token: 'old' };
    writeLock(stale);
    const guard = join(directory, `${RUN_LOCK_FILE}.takeover`);
    // A live taker (this process) holds the guard: the stale lock is left alone, and the caller is told to retry.
    writeFileSync(guard, JSON.stringify({ ...stale, pid: process.pid, token: 'taker' }));
    expect(() => acquireRunLock(directory)).toThrow(/could not take the lock .* try again$/);
    expect(readRunLock(directory)?.token).toBe('old');
    // The taker died holding it: one line naming the file to delete; nothing removed.
    writeFileSync(guard, JSON.stringify({ ...stale, token: 'taker' }));
    expect(() => acquireRunLock(directory)).toThrow(
      new RegExp(`died and left '${guard}'; if no sweep runs there, delete it$`),
    );
    expect(readdirSync(directory).sort()).toEqual([RUN_LOCK_FILE, `${RUN_LOCK_FILE}.takeover`]);
    rmSync(guard);
    const lock = acquireRunLock(directory);
    expect(lock.tookOverFrom).toEqual(stale);
    expect(readdirSync(directory)).toEqual([RUN_LOCK_FILE]);
    lock.release();
  });

  it('throws a DiskError when the directory cannot be made', () => {
    writeFileSync(join(directory, 'plain'), '');
    expect(() => acquireRunLock(join(directory, 'plain', 'run'))).toThrow(/^cannot lock '.*run\.lock': /);
  });
});

describe('acquireRunLock(directory) by racing processes', () => {
  // Five real processes race on a loaded 2-core machine; it failed once there under heavy load from
  // other work, so it is retried (a real race would fail every try far more often than that).
  it('lets exactly one of five processes take the lock over a stale one', { retry: 2 }, async () => {
    const code = join(directory, 'code');
    const runs = join(directory, 'run');
    transpileDurableModules(['lock', 'disk-error', 'file-system'], code);
    mkdirSync(runs);
    // Each racer says 'ready', spins until the 'go' file appears, tries the lock, prints the outcome,
    // and a winner holds the lock until the 'done' file appears (so no late racer finds it free).
    writeFileSync(
      join(code, 'racer.js'),
      `import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { acquireRunLock } from './lock.js';
const [runs, signals] = process.argv.slice(2);
console.log('ready');
while (!existsSync(join(signals, 'go'))) {}
try {
  const lock = acquireRunLock(runs);
  console.log(lock.tookOverFrom ? 'won over stale' : 'won');
  const wait = setInterval(() => {
    if (existsSync(join(signals, 'done'))) { clearInterval(wait); lock.release(); }
  }, 5);
} catch (error) {
  console.log('lost ' + error.name);
}
`,
    );
    writeFileSync(
      join(runs, RUN_LOCK_FILE),
      JSON.stringify({ pid: deadPid(), hostname: hostname(), bootId: currentBootId(), startedAt: 'x', token: 'old' }),
    );
    const racers = 5;
    let ready = 0;
    const outcomes: string[] = [];
    const exits: Promise<void>[] = [];
    for (let racer = 0; racer < racers; racer++) {
      const child = spawn(process.execPath, [join(code, 'racer.js'), runs, directory], {
        stdio: ['ignore', 'pipe', 'inherit'],
      });
      let buffered = '';
      child.stdout.setEncoding('utf8').on('data', (chunk: string) => {
        buffered += chunk;
        const lines = buffered.split('\n');
        buffered = lines.pop() ?? '';
        for (const line of lines) {
          if (line === 'ready' && ++ready === racers) writeFileSync(join(directory, 'go'), '');
          else if (line !== 'ready') {
            outcomes.push(line);
            if (outcomes.length === racers) writeFileSync(join(directory, 'done'), '');
          }
        }
      });
      exits.push(
        new Promise((resolve, reject) => {
          child.on('error', reject);
          child.on('exit', () => resolve());
        }),
      );
    }
    await Promise.all(exits);
    // Exactly one lock is held; the winner is whoever links first, which need not be the process
    // that removed the stale lock under the takeover guard.
    expect(outcomes.filter((outcome) => outcome.startsWith('won'))).toHaveLength(1);
    expect(outcomes.filter((outcome) => outcome === 'lost RunLockError')).toHaveLength(racers - 1);
    expect(readdirSync(runs)).toEqual([]);
  });
});
