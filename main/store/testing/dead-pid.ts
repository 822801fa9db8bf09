/** The pid of a real process that has already exited (spawned here, waited for). */
import { spawn } from 'node:child_process';

export function deadPid(): Promise<number> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['-e', ''], { stdio: 'ignore' });
    child.on('error', reject);
    child.on('exit', () => {
      if (child.pid === undefined) reject(new Error('child had no pid'));
      else resolve(child.pid);
    });
  });
}
