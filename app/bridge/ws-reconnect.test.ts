import { describe, expect, it } from 'vitest';
import { FakeSocket, FakeTimers } from './testing/fake-socket.ts';
import { ReconnectingSocket, type LinkState } from './ws-reconnect.ts';

function setup(createFails: () => boolean = () => false) {
  const sockets: FakeSocket[] = [];
  const timers = new FakeTimers();
  const log: string[] = [];
  const link = new ReconnectingSocket({
    url: 'ws://127.0.0.1:7788/api?token=abc',
    createSocket: (url) => {
      if (createFails()) throw new Error('refused');
      const socket = new FakeSocket(url);
      sockets.push(socket);
      return socket;
    },
    timers,
    reconnectDelaysMs: [100, 200, 400],
    onOpen: () => log.push('open'),
    onMessage: (data) => log.push(`message ${String(data)}`),
    onLost: () => log.push(`lost (state still ${link.state})`),
  });
  link.subscribe((state: LinkState) => log.push(`state ${state}`));
  const last = (): FakeSocket => {
    const socket = sockets[sockets.length - 1];
    if (!socket) throw new Error('no socket');
    return socket;
  };
  return { link, sockets, timers, log, last };
}

describe('ReconnectingSocket', () => {
  it('opens a socket at once for binary frames as ArrayBuffers, and sends only once it is open', () => {
    const { link, sockets, log, last } = setup();
    expect(sockets).toHaveLength(1);
    expect(last().url).toBe('ws://127.0.0.1:7788/api?token=abc');
    expect(last().binaryType).toBe('arraybuffer');
    expect(link.state).toBe('connecting');
    expect(link.canSend).toBe(false);
    last().accept();
    expect(link.canSend).toBe(true);
    link.send('{"id":1}');
    expect(last().sent).toEqual(['{"id":1}']);
    last().onmessage?.({ data: 'hello' });
    expect(log).toEqual(['state open', 'open', 'message hello']);
  });

  it('tells its owner of a loss before the state turns lost, then retries with growing delays', () => {
    const { link, sockets, timers, log, last } = setup();
    last().accept();
    last().drop();
    expect(log).toEqual(['state open', 'open', 'lost (state still open)', 'state lost']);
    expect(link.canSend).toBe(false);
    expect(timers.runNext()).toBe(100);
    last().drop(); // never opened: no second loss for the owner, the state stays lost
    expect(timers.runNext()).toBe(200);
    last().drop();
    expect(timers.runNext()).toBe(400);
    last().drop();
    expect(timers.runNext()).toBe(400); // the last delay repeats
    expect(sockets).toHaveLength(5);
    last().accept();
    last().drop();
    expect(timers.runNext()).toBe(100); // an open socket starts the delays again
  });

  it('retries when the socket cannot even be created', () => {
    let fail = true;
    const { link, sockets, timers } = setup(() => fail);
    expect(sockets).toHaveLength(0);
    expect(link.state).toBe('lost');
    expect(timers.queue.map((t) => t.delayMs)).toEqual([100]);
    fail = false;
    timers.runNext();
    expect(sockets).toHaveLength(1);
  });

  it('ignores a replaced socket, and stops for good on close()', () => {
    const { link, sockets, timers, log, last } = setup();
    const first = last();
    first.accept();
    first.drop();
    timers.runNext();
    first.onmessage?.({ data: 'late' }); // the old socket's handlers are no longer the link's
    expect(log).not.toContain('message late');
    last().accept();
    const openSocket = last();
    link.close();
    expect(openSocket.readyState).toBe(3);
    expect(link.closed).toBe(true);
    expect(link.state).toBe('lost');
    expect(timers.queue).toHaveLength(0);
    expect(sockets).toHaveLength(2);
    expect(log.filter((entry) => entry.startsWith('lost'))).toHaveLength(1); // close() is not a loss
    expect(() => link.send('x')).toThrow(/no open socket/);
  });
});
