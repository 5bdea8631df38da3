// Webhook delivery as Stripe does it: the event as JSON, signed with the endpoint's secret in a
// `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<payload>">` header, and retried with a
// doubling delay while the endpoint does not answer 2xx.
import { createHmac } from "node:crypto";
import type { Delivery, Event, Store } from "./state.ts";
import { now } from "./state.ts";

export function signPayload(payload: string, secret: string, timestamp = now()): string {
  const signature = createHmac("sha256", secret).update(`${timestamp}.${payload}`, "utf8").digest("hex");
  return `t=${timestamp},v1=${signature}`;
}

export type DeliveryOptions = {
  url: string;
  secret: string;
  /** Delay before the first retry; each further retry waits twice as long. */
  retryBaseMs: number;
  /** Attempts in all, the first one included. */
  maxAttempts: number;
  attemptTimeoutMs: number;
};

export class WebhookDeliverer {
  private readonly timers = new Map<string, NodeJS.Timeout>();
  private readonly inFlight = new AbortController();
  private stopped = false;

  constructor(
    private readonly store: Store,
    private readonly options: DeliveryOptions,
  ) {}

  /** Queues the event and resolves once its first attempt is over (delivered or not). */
  enqueue(event: Event): Promise<Delivery> {
    this.store.state.pending.push({ event_id: event.id, attempts: 0, next_attempt_at: Date.now() });
    this.store.save();
    return this.attempt(event.id);
  }

  /** One extra attempt now, with a fresh signature (the test-only "replay" of an event). */
  resend(eventId: string): Promise<Delivery> {
    return this.attempt(eventId, { manual: true });
  }

  /** After a restart: carry on with the deliveries that were still pending. */
  resume() {
    for (const pending of this.store.state.pending) {
      this.schedule(pending.event_id, Math.max(0, pending.next_attempt_at - Date.now()));
    }
  }

  stop() {
    this.stopped = true;
    for (const timer of this.timers.values()) clearTimeout(timer);
    this.timers.clear();
    this.inFlight.abort();
  }

  private schedule(eventId: string, delayMs: number) {
    if (this.stopped) return;
    clearTimeout(this.timers.get(eventId));
    const timer = setTimeout(() => {
      this.timers.delete(eventId);
      void this.attempt(eventId);
    }, delayMs);
    timer.unref();
    this.timers.set(eventId, timer);
  }

  private async attempt(eventId: string, { manual = false } = {}): Promise<Delivery> {
    const { state } = this.store;
    const event = state.events[eventId];
    if (!event) throw new Error(`no event ${eventId}`);
    const pending = state.pending.find((entry) => entry.event_id === eventId);
    const attemptNumber = state.deliveries.filter((delivery) => delivery.event_id === eventId).length + 1;
    const payload = JSON.stringify(event, null, 2);
    const delivery: Delivery = {
      event_id: eventId,
      event_type: event.type,
      attempt: attemptNumber,
      url: this.options.url,
      at: Date.now(),
      status: null,
      error: null,
      delivered: false,
    };
    try {
      const response = await fetch(this.options.url, {
        method: "POST",
        headers: {
          "Content-Type": "application/json; charset=utf-8",
          "Stripe-Signature": signPayload(payload, this.options.secret),
          "User-Agent": "tenthmark-payments-stand-in",
        },
        body: payload,
        signal: AbortSignal.any([this.inFlight.signal, AbortSignal.timeout(this.options.attemptTimeoutMs)]),
      });
      await response.arrayBuffer();
      delivery.status = response.status;
      delivery.delivered = response.status >= 200 && response.status < 300;
      if (!delivery.delivered) delivery.error = `answered ${response.status}`;
    } catch (error) {
      delivery.error = error instanceof Error ? (error.cause instanceof Error ? error.cause.message : error.message) : String(error);
    }
    if (this.stopped) return delivery;

    state.deliveries.push(delivery);
    if (delivery.delivered) {
      event.pending_webhooks = 0;
      state.pending = state.pending.filter((entry) => entry.event_id !== eventId);
      clearTimeout(this.timers.get(eventId));
      this.timers.delete(eventId);
    } else if (pending && !manual) {
      pending.attempts += 1;
      if (pending.attempts >= this.options.maxAttempts) {
        state.pending = state.pending.filter((entry) => entry !== pending);
      } else {
        const delayMs = this.options.retryBaseMs * 2 ** (pending.attempts - 1);
        pending.next_attempt_at = Date.now() + delayMs;
        this.schedule(eventId, delayMs);
      }
    }
    this.store.save();
    return delivery;
  }
}
