package org.hullbound.gibbs;

import java.util.function.Function;
import java.util.random.RandomGenerator;

/**
 * A joint draw of a block of coefficients from its multivariate normal full conditional, through
 * the Cholesky factor of its precision ({@link CanonicalNormal}, Rue 2001).
 *
 * <p>Drawing correlated coefficients together removes the slow mixing that one-at-a-time updates
 * show when covariates are collinear.
 */
final class BlockNormalUpdater implements Updater {
  private final int[] block;
  private final Function<double[], CanonicalNormal> posterior;
  private final double[] draw;
  private long draws;

  BlockNormalUpdater(UpdateRule.BlockNormal rule) {
    this.block = rule.indices();
    this.posterior = rule.posterior();
    this.draw = new double[block.length];
  }

  @Override
  public void update(double[] state, RandomGenerator rng) {
    CanonicalNormal normal = posterior.apply(state);
    normal.draw(rng, draw);
    for (int k = 0; k < block.length; k++) {
      state[block[k]] = draw[k];
    }
    draws += block.length;
  }

  @Override
  public int[] indices() {
    return block.clone();
  }

  @Override
  public String method() {
    return "block normal (" + block.length + " jointly)";
  }

  @Override
  public long draws() {
    return draws;
  }

  @Override
  public UpdaterState save() {
    return UpdaterState.ofDrawCount(draws);
  }

  @Override
  public void restore(UpdaterState saved) {
    draws = UpdaterState.drawCountOf(saved, method());
  }

  @Override
  public long evaluations() {
    return 0;
  }
}
