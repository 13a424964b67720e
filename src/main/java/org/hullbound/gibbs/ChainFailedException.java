package org.hullbound.gibbs;

/**
 * A chain stopped because its kernel threw; names the chain and the sweep.
 *
 * <p>The other chains are stopped too; the draws handed on before the failure stay valid.
 */
public final class ChainFailedException extends RuntimeException {
  private final int chain;
  private final long sweep;

  public ChainFailedException(int chain, long sweep, Throwable cause) {
    super("chain " + (chain + 1) + " failed in sweep " + sweep + ": " + cause.getMessage(), cause);
    this.chain = chain;
    this.sweep = sweep;
  }

  /** The failed chain's index, from 0. */
  public int chain() {
    return chain;
  }

  /** The 1-based sweep in which it failed. */
  public long sweep() {
    return sweep;
  }
}
