import { BusyError } from "@/lib/errors";

export interface WriteGateOptions {
  /** Batches written at once; the rest of the connection pool stays free for reads (status polls, pages). */
  concurrency: number;
  /** Batches that may wait for a turn; one more is refused at once. */
  maxQueued: number;
  /** How long a batch may wait for its turn before it is refused, in milliseconds. */
  maxWaitMs: number;
}

interface Waiter {
  start: () => void;
  timer: NodeJS.Timeout;
}

const RETRY_AFTER_SECONDS = 2;

/**
 * A first-come, first-served limit on concurrent batch writes in this process. Without it, fifty
 * pipelines hold every pooled connection in long transactions and dashboards wait behind them; with
 * it, a saturated service refuses early with 503 + Retry-After, which a pipeline retries under the
 * same idempotency key.
 */
export class WriteGate {
  private running = 0;
  private readonly queue: Waiter[] = [];

  constructor(private readonly options: WriteGateOptions) {}

  get active(): number {
    return this.running;
  }

  get waiting(): number {
    return this.queue.length;
  }

  async run<T>(work: () => Promise<T>): Promise<T> {
    await this.enter();
    try {
      return await work();
    } finally {
      this.leave();
    }
  }

  private enter(): Promise<void> {
    if (this.running < this.options.concurrency && this.queue.length === 0) {
      this.running += 1;
      return Promise.resolve();
    }
    if (this.queue.length >= this.options.maxQueued) return Promise.reject(busy());
    return new Promise((resolve, reject) => {
      const waiter: Waiter = {
        start: () => {
          clearTimeout(waiter.timer);
          this.running += 1;
          resolve();
        },
        timer: setTimeout(() => {
          const index = this.queue.indexOf(waiter);
          if (index >= 0) this.queue.splice(index, 1);
          reject(busy());
        }, this.options.maxWaitMs),
      };
      this.queue.push(waiter);
    });
  }

  private leave(): void {
    this.running -= 1;
    const next = this.queue.shift();
    next?.start();
  }
}

function busy(): BusyError {
  return new BusyError("Too many batches are being stored right now; nothing from this one was stored. Retry it with the same Idempotency-Key.", RETRY_AFTER_SECONDS);
}
