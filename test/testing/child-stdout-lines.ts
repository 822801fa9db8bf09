/**
 * Whole lines from a child process's stdout. Chunks split lines anywhere, so
 * the unfinished tail is held back until its newline arrives; `afterChunk`
 * runs once each chunk's lines are handled (e.g. to decide on a kill).
 */
import type { ChildProcess } from 'node:child_process';

export function onStdoutLines(child: ChildProcess, onLine: (line: string) => void, afterChunk?: () => void): void {
  let buffered = '';
  child.stdout?.on('data', (chunk: Buffer) => {
    buffered += chunk.toString();
    const lines = buffered.split('\n');
    buffered = lines.pop() ?? '';
    for (const line of lines) onLine(line);
    afterChunk?.();
  });
}
