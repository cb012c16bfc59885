/**
 * A gateway-like client for fault tests: posts each snapshot until it gets a final answer,
 * honouring Retry-After on 429/503 and backing off on network errors. Bounded in time.
 */
export interface PostOutcome {
  uid: string;
  status: number;
  attempts: number;
  /** Date.now() when the final answer came. */
  answeredAt: number;
}

export async function postUntilAnswered(
  url: string,
  key: string,
  body: { uid: string },
  deadlineMs = 60_000,
): Promise<PostOutcome> {
  const until = Date.now() + deadlineMs;
  let attempts = 0;
  let delay = 100;
  for (;;) {
    attempts++;
    try {
      const res = await fetch(`${url}/api/ingest/v1/snapshots`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
        body: JSON.stringify(body),
        signal: AbortSignal.timeout(10_000),
      });
      if (res.status !== 429 && res.status < 500) {
        await res.arrayBuffer();
        return { uid: body.uid, status: res.status, attempts, answeredAt: Date.now() };
      }
      const retryAfter = Number(res.headers.get('retry-after'));
      await res.arrayBuffer();
      // Tests shorten the wait; a real gateway waits the full Retry-After.
      delay =
        Number.isFinite(retryAfter) && retryAfter > 0
          ? Math.min(retryAfter * 1000, 500)
          : Math.min(delay * 2, 2000);
    } catch {
      delay = Math.min(delay * 2, 1000);
    }
    if (Date.now() + delay > until)
      throw new Error(`gave up on ${body.uid} after ${attempts} attempts`);
    await new Promise((r) => setTimeout(r, delay));
  }
}
