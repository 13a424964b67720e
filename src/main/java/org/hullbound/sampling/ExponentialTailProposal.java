package org.hullbound.sampling;

import java.util.random.RandomGenerator;

/** {@code shift + Exp(rate)} by inversion, one uniform per draw; built by {@link Proposal}. */
record ExponentialTailProposal(double shift, double rate) implements Proposal {
  @Override
  public double draw(RandomGenerator rng) {
    // 1 - u lies in (0, 1], so the logarithm is finite.
    return shift - Math.log1p(-rng.nextDouble()) / rate;
  }

  @Override
  public double logDensity(double x) {
    return x >= shift ? Math.log(rate) - rate * (x - shift) : Double.NEGATIVE_INFINITY;
  }

  @Override
  public double lower() {
    return shift;
  }
}
