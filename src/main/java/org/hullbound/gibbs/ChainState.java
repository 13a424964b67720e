package org.hullbound.gibbs;

/**
 * Where one chain stood when a run stopped: sweeps made, draws kept, the generator's state and the
 * kernel's state.
 *
 * <p>The unit of a checkpoint: {@link ChainRunner#resume} continues each chain from it, and the
 * continued chain makes the same draws as one that never stopped.
 *
 * @param sweep sweeps made so far (burn-in included), from 0
 * @param draws draws kept so far
 * @param generator the chain generator's state ({@link ChainRandom#state()})
 * @param kernel the kernel's state
 */
public record ChainState(long sweep, int draws, long[] generator, KernelState kernel) {

  public ChainState {
    if (sweep < 0 || draws < 0) {
      throw new IllegalArgumentException(
          "sweep and draws must be >= 0, got " + sweep + " and " + draws);
    }
    if (generator == null || generator.length != ChainRandom.STATE_LENGTH || kernel == null) {
      throw new IllegalArgumentException(
          "need a generator state of " + ChainRandom.STATE_LENGTH + " numbers and a kernel state");
    }
    generator = generator.clone();
  }

  @Override
  public long[] generator() {
    return generator.clone();
  }
}
