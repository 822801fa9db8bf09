import { describe, expect, it } from 'vitest';
import type { BenchEvent } from '../../app/contract/bench-api.ts';
import { EventHub } from './event-hub.ts';

describe('EventHub', () => {
  it('keeps delivering to the others when one listener throws, and reports the error (issue 10 item 2)', () => {
    const reported: [string, string][] = [];
    const hub = new EventHub((error, event) => reported.push([(error as Error).message, event.type]));
    const seen: string[] = [];
    hub.subscribe(() => {
      throw new Error('socket closed');
    });
    hub.subscribe((event) => seen.push(event.type));
    const event: BenchEvent = { type: 'error', message: 'probe' };
    hub.emit(event);
    expect(seen).toEqual(['error']);
    expect(reported).toEqual([['socket closed', 'error']]);
  });
});
