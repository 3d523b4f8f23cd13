import { afterEach, describe, expect, it, vi } from "vitest";
import { BusyError } from "@/lib/errors";
import { WriteGate } from "@/lib/ingest/write-gate";

function deferred() {
  let release!: () => void;
  const promise = new Promise<void>((resolve) => (release = resolve));
  return { promise, release };
}

afterEach(() => vi.useRealTimers());

describe("WriteGate", () => {
  it("runs at most `concurrency` batches at once, the others in arrival order", async () => {
    const gate = new WriteGate({ concurrency: 2, maxQueued: 10, maxWaitMs: 10_000 });
    const started: number[] = [];
    const holds = Array.from({ length: 5 }, deferred);
    const runs = holds.map((hold, index) =>
      gate.run(async () => {
        started.push(index);
        await hold.promise;
        return index;
      }),
    );
    await Promise.resolve();
    expect(started).toEqual([0, 1]);
    expect(gate.waiting).toBe(3);
    holds[1].release();
    await runs[1];
    await Promise.resolve();
    expect(started).toEqual([0, 1, 2]);
    for (const hold of holds) hold.release();
    expect(await Promise.all(runs)).toEqual([0, 1, 2, 3, 4]);
    expect(started).toEqual([0, 1, 2, 3, 4]);
    expect(gate.active).toBe(0);
  });

  it("refuses at once with 503 and Retry-After when the queue is full", async () => {
    const gate = new WriteGate({ concurrency: 1, maxQueued: 1, maxWaitMs: 10_000 });
    const hold = deferred();
    const first = gate.run(() => hold.promise);
    const second = gate.run(async () => "second");
    const third = gate.run(async () => "third");
    await expect(third).rejects.toBeInstanceOf(BusyError);
    await expect(third).rejects.toMatchObject({ status: 503, retryAfterSeconds: 2 });
    hold.release();
    await first;
    expect(await second).toBe("second");
  });

  it("refuses a batch that waited longer than maxWaitMs and never runs it", async () => {
    vi.useFakeTimers();
    const gate = new WriteGate({ concurrency: 1, maxQueued: 5, maxWaitMs: 1_000 });
    const hold = deferred();
    const first = gate.run(() => hold.promise);
    const work = vi.fn(async () => "late");
    const late = gate.run(work);
    const check = expect(late).rejects.toBeInstanceOf(BusyError);
    await vi.advanceTimersByTimeAsync(1_001);
    await check;
    expect(gate.waiting).toBe(0);
    hold.release();
    await first;
    expect(work).not.toHaveBeenCalled();
  });

  it("frees the slot when a batch fails", async () => {
    const gate = new WriteGate({ concurrency: 1, maxQueued: 5, maxWaitMs: 1_000 });
    await expect(gate.run(async () => Promise.reject(new Error("refused rows")))).rejects.toThrow("refused rows");
    expect(gate.active).toBe(0);
    expect(await gate.run(async () => "next")).toBe("next");
  });
});
