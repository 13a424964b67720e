package org.hullbound.gibbs;

import java.util.concurrent.atomic.AtomicBoolean;

/**
 * A cooperative request to stop, checked by every chain at the end of each sweep.
 *
 * <p>An interrupt (Ctrl-C) sets it; chains then finish the sweep they are in, so that every draw
 * already handed on is whole and the draws file stays valid.
 */
public final class StopSignal {
  private final AtomicBoolean requested = new AtomicBoolean();

  private StopSignal() {}

  /** A signal not yet raised. */
  public static StopSignal create() {
    return new StopSignal();
  }

  /** Asks every chain to stop after its current sweep; safe from any thread, idempotent. */
  public void request() {
    requested.set(true);
  }

  public boolean isRequested() {
    return requested.get();
  }
}
