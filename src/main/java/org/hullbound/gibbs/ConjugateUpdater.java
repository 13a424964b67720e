package org.hullbound.gibbs;

import java.util.random.RandomGenerator;

/**
 * An exact draw from a conjugate full conditional: no density evaluation, no tuning.
 *
 * <p>The draw itself (normal, gamma, beta, ...) comes from the model's conjugate analysis
 * (Gelman et al., Bayesian Data Analysis, 3rd ed., ch. 2-3) through {@link
 * UpdateRule.ConjugateDraw}.
 */
final class ConjugateUpdater implements Updater {
  private final int index;
  private final String family;
  private final UpdateRule.ConjugateDraw draw;
  private long draws;

  ConjugateUpdater(UpdateRule.Conjugate rule) {
    this.index = rule.index();
    this.family = rule.family();
    this.draw = rule.draw();
  }

  @Override
  public void update(double[] state, RandomGenerator rng) {
    state[index] = draw.draw(state, rng);
    draws++;
  }

  @Override
  public int[] indices() {
    return new int[] {index};
  }

  @Override
  public String method() {
    return family.startsWith("predictive") ? family : "conjugate " + family;
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
