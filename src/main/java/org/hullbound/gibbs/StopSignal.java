package org.hullbound.gibbs;

import java.util.concurrent.atomic.AtomicBoolean;

/**
 * A cooperative request to stop, checked by every chain at the end of each sweep and, cheaply,
 * between the updates of a sweep.
 *
 * <p>An interrupt (Ctrl-C) sets it; chains then finish the sweep they are in, so that every draw
 * already handed on is whole and the draws file stays valid. A sweep still running a while after
 * the request is given up instead ({@link ChainRunner}), so that a slow sweep cannot hold a stop.
 */
public final class StopSignal {
  private final AtomicBoolean requested = new AtomicBoolean();
  /** {@link System#nanoTime()} of the first request; read only once {@link #requested} is set. */
  private volatile long requestedAt;

  private StopSignal() {}

  /** A signal not yet raised. */
  public static StopSignal create() {
    return new StopSignal();
  }

  /** Asks every chain to stop after its current sweep; safe from any thread, idempotent. */
  public void request() {
    long now = System.nanoTime();
    if (!requested.get()) {
      requestedAt = now;
    }
    requested.set(true);
  }

  /** Whether a stop was requested at least {@code nanos} nanoseconds ago. */
  public boolean requestedLongerAgoThan(long nanos) {
    return requested.get() && System.nanoTime() - requestedAt >= nanos;
  }

  public boolean isRequested() {
    return requested.get();
  }
}
