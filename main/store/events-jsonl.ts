/**
 * events.jsonl: one JSON object per line with a numeric `time_s` and a string
 * `type`. Lines that are torn (no newline at the end of the file), not JSON,
 * or not such an object are dropped and their line numbers reported.
 */
import type { RunEvent } from '../../app/contract/bench-api.ts';

export interface ParsedEvents {
  events: RunEvent[];
  droppedLines: number[];
}

function isRunEvent(value: unknown): value is RunEvent {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return false;
  const record = value as Record<string, unknown>;
  return typeof record.time_s === 'number' && typeof record.type === 'string';
}

export function parseEventsJsonl(text: string): ParsedEvents {
  const lines = text.split('\n');
  const tail = lines.pop() ?? '';
  const events: RunEvent[] = [];
  const droppedLines: number[] = [];
  lines.forEach((line, i) => {
    if (line.trim() === '') return;
    try {
      const value: unknown = JSON.parse(line);
      if (isRunEvent(value)) events.push(value);
      else droppedLines.push(i + 1);
    } catch {
      droppedLines.push(i + 1);
    }
  });
  if (tail.trim() !== '') droppedLines.push(lines.length + 1);
  return { events, droppedLines };
}

/** Text to append so a new event starts on its own line even after a torn tail. */
export function eventLineAfter(existing: string, event: RunEvent): string {
  const lead = existing === '' || existing.endsWith('\n') ? '' : '\n';
  return `${lead}${JSON.stringify(event)}\n`;
}
