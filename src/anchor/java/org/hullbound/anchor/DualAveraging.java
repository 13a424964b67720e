package org.hullbound.anchor;

/**
 * The step size of the No-U-Turn sampler's warm-up, tuned so that the mean acceptance statistic
 * approaches {@code delta}: Nesterov's dual averaging as Hoffman and Gelman (2014, J. Mach. Learn.
 * Res. 15, 1593-1623, section 3.2.1 and Algorithm 5) adapt it, with their constants {@code gamma =
 * 0.05}, {@code t0 = 10}, {@code kappa = 0.75} and {@code mu = log(10 epsilon_0)}.
 *
 * <p>Mutable: one per chain, restarted (a new instance) whenever the mass matrix changes.
 */
final class DualAveraging {
  private static final double GAMMA = 0.05;
  private static final double T0 = 10;
  private static final double KAPPA = 0.75;

  private final double mu;
  private final double delta;
  private long m;
  private double meanError;
  private double logAveraged;

  private DualAveraging(double mu, double delta) {
    this.mu = mu;
    this.delta = delta;
  }

  /** Starts from step size {@code start} toward mean acceptance {@code delta}. */
  static DualAveraging from(double start, double delta) {
    if (!(start > 0) || !(delta > 0 && delta < 1)) {
      throw new IllegalArgumentException(
          "start must be > 0 and delta in (0, 1), got " + start + " and " + delta);
    }
    return new DualAveraging(Math.log(10 * start), delta);
  }

  /** Takes the acceptance statistic {@code alpha / n_alpha} of an iteration; the next step size. */
  double update(double acceptance) {
    m++;
    double eta = 1 / (m + T0);
    meanError = (1 - eta) * meanError + eta * (delta - acceptance);
    double logStep = mu - Math.sqrt(m) / GAMMA * meanError;
    double weight = Math.pow(m, -KAPPA);
    logAveraged = weight * logStep + (1 - weight) * logAveraged;
    return Math.exp(logStep);
  }

  /** The averaged step size {@code epsilon-bar}, used once the warm-up ends. */
  double averaged() {
    return Math.exp(logAveraged);
  }
}
