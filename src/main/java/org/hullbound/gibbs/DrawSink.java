package org.hullbound.gibbs;

/**
 * Receives each kept draw as it is made, for example to stream it to a file.
 *
 * <p>Called from the chain threads, possibly at the same time for different chains: implementations
 * must be thread-safe. The {@code values} array is reused by the caller after the call returns.
 */
@FunctionalInterface
public interface DrawSink {

  /**
   * @param chain the chain's index, from 0
   * @param draw the kept draw's number within its chain, from 1
   * @param values the recorded values, {@link ChainKernel#width()} of them
   */
  void accept(int chain, int draw, double[] values);

  /** A sink that drops every draw. */
  static DrawSink discard() {
    return (chain, draw, values) -> { };
  }
}
