/**
 * The peer (issue 12 item 5): a fixed-settle sweep written the way such
 * scripts usually are by hand — a plain TCP socket per instrument, `VOLT`,
 * sleep 0.5 s, N × `READ?`, no settling logic, no edge search, no
 * read-back. It is the yardstick for tunebench's own sweep in the bench.
 */
import { Socket } from 'node:net';
import { performance } from 'node:perf_hooks';

/** One line-oriented SCPI connection: write a line, read a line. */
class LineSocket {
  readonly #socket = new Socket();
  #buffer = '';
  #waiting: ((line: string) => void)[] = [];

  async connect(address: string): Promise<void> {
    const m = /^tcp:\/\/([^:]+):(\d+)$/.exec(address);
    if (!m) throw new Error(`peer: expected tcp://HOST:PORT, got ${address}`);
    await new Promise<void>((resolve, reject) => {
      this.#socket.once('error', reject);
      this.#socket.connect(Number(m[2]), m[1] as string, () => resolve());
    });
    this.#socket.setNoDelay(true);
    this.#socket.on('data', (chunk: Buffer) => {
      this.#buffer += chunk.toString('latin1');
      let nl: number;
      while ((nl = this.#buffer.indexOf('\n')) >= 0) {
        const line = this.#buffer.slice(0, nl).replace(/\r$/, '');
        this.#buffer = this.#buffer.slice(nl + 1);
        this.#waiting.shift()?.(line);
      }
    });
  }

  write(command: string): void {
    this.#socket.write(`${command}\n`);
  }

  query(command: string): Promise<string> {
    return new Promise((resolve) => {
      this.#waiting.push(resolve);
      this.write(command);
    });
  }

  close(): void {
    this.#socket.end();
  }
}

const sleep = (s: number): Promise<void> => new Promise((resolve) => setTimeout(resolve, s * 1000));

export interface PeerResult {
  wallS: number;
  /** Mean frequency per control voltage (NaN where every reading was no-signal). */
  curve: Map<number, number>;
}

/** Steps through `pointsV`, sleeping `settleS` after each `VOLT`, then `readings` × `READ?`. */
export async function runPeerScript(
  addresses: { supply: string; counter: string },
  pointsV: number[],
  readings: number,
  settleS: number,
  gateS: number,
): Promise<PeerResult> {
  const supply = new LineSocket();
  const counter = new LineSocket();
  await supply.connect(addresses.supply);
  await counter.connect(addresses.counter);
  const t0 = performance.now();
  supply.write('INST:NSEL 1');
  supply.write('CURR 0.02');
  supply.write(`VOLT ${pointsV[0]}`);
  supply.write('OUTP ON');
  counter.write(`FREQ:APER ${gateS}`);
  await supply.query('*OPC?');
  await counter.query('*OPC?');
  const curve = new Map<number, number>();
  for (const v of pointsV) {
    supply.write(`VOLT ${v.toFixed(4)}`);
    await sleep(settleS);
    let sum = 0;
    let n = 0;
    for (let r = 0; r < readings; r++) {
      const f = Number.parseFloat(await counter.query('READ?'));
      // 9.91E37 is the counter's "no signal".
      if (Number.isFinite(f) && f > 0 && f < 9e37) {
        sum += f;
        n++;
      }
    }
    curve.set(Math.round(v * 1e6) / 1e6, n > 0 ? sum / n : Number.NaN);
  }
  supply.write('VOLT 0');
  supply.write('OUTP OFF');
  await supply.query('*OPC?');
  const wallS = (performance.now() - t0) / 1000;
  supply.close();
  counter.close();
  return { wallS, curve };
}
