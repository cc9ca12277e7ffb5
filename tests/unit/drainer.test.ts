import { afterEach, describe, expect, it, vi } from "vitest";
import { createDrainer, type Drainer } from "../../app/utils/drainer.server";

/** A work function whose runs the test finishes by hand, recording how many run at once. */
function gatedWork() {
  const gates: (() => void)[] = [];
  const state = { started: 0, finished: 0, concurrent: 0, most: 0 };
  const work = () =>
    new Promise<void>((resolve) => {
      state.started++;
      state.concurrent++;
      state.most = Math.max(state.most, state.concurrent);
      gates.push(() => {
        state.concurrent--;
        state.finished++;
        resolve();
      });
    });
  const release = async () => {
    await vi.waitFor(() => expect(gates.length).toBeGreaterThan(0));
    gates.shift()!();
  };
  return { work, state, release };
}

describe("createDrainer", () => {
  let drainer: Drainer | undefined;
  afterEach(async () => {
    await drainer?.stop();
    vi.useRealTimers();
  });

  it("never runs twice at once, and a request during a run runs once more (not once per request)", async () => {
    const { work, state, release } = gatedWork();
    drainer = createDrainer("test", work, 60_000);
    const first = drainer.kick();
    void drainer.kick();
    void drainer.kick();
    void drainer.kick();
    expect(state.started).toBe(1);
    await release(); // the first run ends; three requests came during it: exactly one more run
    await release();
    await first;
    expect(state).toMatchObject({ started: 2, finished: 2, most: 1 });
    // Idle again: a new request starts a fresh run.
    const next = drainer.kick();
    await release();
    await next;
    expect(state.started).toBe(3);
  });

  it("stop waits for the run in progress", async () => {
    const { work, state, release } = gatedWork();
    drainer = createDrainer("test", work, 60_000);
    void drainer.kick();
    let stopped = false;
    const stopping = drainer.stop().then(() => (stopped = true));
    await new Promise((r) => setTimeout(r, 20));
    expect(stopped).toBe(false);
    await release();
    await stopping;
    expect(stopped).toBe(true);
    expect(state.finished).toBe(1);
  });

  it("a failed run is logged, not thrown, and the next request runs again", async () => {
    const error = vi.spyOn(console, "error").mockImplementation(() => {});
    let calls = 0;
    drainer = createDrainer("test", async () => {
      calls++;
      if (calls === 1) throw new Error("SMTP down");
    }, 60_000);
    await drainer.kick();
    await drainer.kick();
    expect(calls).toBe(2);
    expect(error).toHaveBeenCalledWith("[test]", "SMTP down");
    error.mockRestore();
  });

  it("the timer runs the work every interval until stopped", async () => {
    vi.useFakeTimers();
    let calls = 0;
    drainer = createDrainer("test", async () => void calls++, () => 1000);
    drainer.start();
    drainer.start(); // idempotent: one timer
    await vi.advanceTimersByTimeAsync(3500);
    expect(calls).toBe(3);
    await drainer.stop();
    await vi.advanceTimersByTimeAsync(5000);
    expect(calls).toBe(3);
  });
});
