package org.hullbound.validation;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.function.DoubleBinaryOperator;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.CauchyDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.hullbound.io.CsvData;
import org.hullbound.model.DataTable;

/**
 * Reference values by numerical quadrature for the validation cases that have no closed form,
 * each case's model written again by hand in Java with commons-math3 log-densities.
 *
 * <p>Why by hand: a reference computed from hullbound's own compiled densities would share their
 * faults. Each reference below restates its case's {@code model.hbm} (the two must be kept in
 * step; {@code docs/validation.md} says so) and reads the same data files. Unknowns that a closed
 * form removes exactly are integrated out analytically (the school effects of the eight schools);
 * what is left is integrated on a Simpson grid ({@link Quadrature}).
 */
final class QuadratureReferences {
  private static final int POINTS_1D = 20_001;
  private static final int POINTS_2D = 801;

  private QuadratureReferences() {}

  /** The reference of the case called {@code name}, if it has one. */
  static Optional<CaseReference> forCase(String name) {
    if (!NAMES.contains(name)) {
      return Optional.empty();
    }
    return Optional.of(folder -> compute(name, folder, POINTS_1D, POINTS_2D));
  }

  /** The same values on grids with twice the resolution: to check the grid error in tests. */
  static Map<String, Double> refined(String name, Path folder) {
    return compute(name, folder, 2 * POINTS_1D - 1, 2 * POINTS_2D - 1);
  }

  private static final List<String> NAMES =
      List.of("eight_schools", "bliss_beetles", "darwin_student_t", "sleep_normal");

  private static Map<String, Double> compute(String name, Path folder, int points1, int points2) {
    switch (name) {
      case "eight_schools":
        return eightSchools(folder, points2);
      case "bliss_beetles":
        return blissBeetles(folder, points2);
      case "darwin_student_t":
        return darwinStudentT(folder, points1);
      default:
        return sleepNormal(folder, points2);
    }
  }

  /**
   * Eight schools (Rubin 1981): {@code mu ~ normal(0, 50)}, {@code tau ~ half-cauchy(25)},
   * {@code theta[j] ~ normal(mu, tau)}, {@code y[j] ~ normal(theta[j], sigma[j])}. With the
   * thetas integrated out, {@code y[j] | mu, tau ~ normal(mu, sqrt(sigma[j]^2 + tau^2))} (Gelman
   * et al., BDA3, 5.4); {@code theta[1] | mu, tau, y} is normal with precision-weighted mean,
   * which gives {@code E theta[1]} as an expectation over the (mu, tau) grid.
   */
  private static Map<String, Double> eightSchools(Path folder, int points) {
    DataTable table = CsvData.read(folder.resolve("schools.csv"));
    double[] y = column(table, "y");
    double[] sigma = column(table, "sigma");
    NormalDistribution muPrior = new NormalDistribution(null, 0, 50);
    CauchyDistribution tauPrior = new CauchyDistribution(null, 0, 25);
    DoubleBinaryOperator logPosterior =
        (mu, tau) -> {
          if (!(tau > 0)) {
            // The density is finite at tau = 0; use the limit so the grid may start there.
            tau = 0;
          }
          double total = muPrior.logDensity(mu) + Math.log(2) + tauPrior.logDensity(tau);
          for (int j = 0; j < y.length; j++) {
            total += new NormalDistribution(null, mu, Math.sqrt(sigma[j] * sigma[j] + tau * tau))
                .logDensity(y[j]);
          }
          return total;
        };
    Quadrature.Grid2 grid = Quadrature.posterior2(logPosterior, -150, 150, 0, 400, points);
    double theta1 =
        grid.expectation(
            (mu, tau) -> {
              double dataPrecision = 1 / (sigma[0] * sigma[0]);
              if (tau == 0) {
                return mu;
              }
              double priorPrecision = 1 / (tau * tau);
              return (dataPrecision * y[0] + priorPrecision * mu) / (dataPrecision + priorPrecision);
            });
    Map<String, Double> values = new LinkedHashMap<>();
    values.put("mean(mu)", grid.meanX());
    values.put("sd(mu)", grid.sdX());
    values.put("mean(tau)", grid.meanY());
    values.put("sd(tau)", grid.sdY());
    values.put("mean(theta[1])", theta1);
    return values;
  }

  /**
   * Bliss (1935) beetles: {@code killed[g] ~ binomial(exposed[g], expit(alpha + beta (dose[g]
   * - 1.8)))}, {@code alpha ~ normal(0, 10)}, {@code beta ~ normal(0, 100)}.
   */
  private static Map<String, Double> blissBeetles(Path folder, int points) {
    DataTable table = CsvData.read(folder.resolve("beetles.csv"));
    double[] dose = column(table, "dose");
    double[] exposed = column(table, "exposed");
    double[] killed = column(table, "killed");
    NormalDistribution alphaPrior = new NormalDistribution(null, 0, 10);
    NormalDistribution betaPrior = new NormalDistribution(null, 0, 100);
    DoubleBinaryOperator logPosterior =
        (alpha, beta) -> {
          double total = alphaPrior.logDensity(alpha) + betaPrior.logDensity(beta);
          for (int g = 0; g < dose.length; g++) {
            double eta = alpha + beta * (dose[g] - 1.8);
            double p = 1 / (1 + Math.exp(-eta));
            total += new BinomialDistribution(null, (int) exposed[g], p).logProbability((int) killed[g]);
          }
          return total;
        };
    Quadrature.Grid2 grid = Quadrature.posterior2(logPosterior, -5, 5, 0, 80, points);
    return Map.of(
        "mean(alpha)", grid.meanX(), "sd(alpha)", grid.sdX(),
        "mean(beta)", grid.meanY(), "sd(beta)", grid.sdY());
  }

  /**
   * Darwin's Zea mays differences (Fisher 1935): {@code y[i] ~ student-t(df = 4, location = mu,
   * scale = 30)}, {@code mu ~ normal(0, 100)}.
   */
  private static Map<String, Double> darwinStudentT(Path folder, int points) {
    double[] y = column(CsvData.read(folder.resolve("differences.csv")), "difference");
    NormalDistribution prior = new NormalDistribution(null, 0, 100);
    TDistribution t = new TDistribution(null, 4);
    double scale = 30;
    Quadrature.Grid1 grid =
        Quadrature.posterior1(
            mu -> {
              double total = prior.logDensity(mu);
              for (double v : y) {
                total += t.logDensity((v - mu) / scale) - Math.log(scale);
              }
              return total;
            },
            -500, 500, points);
    return Map.of("mean(mu)", grid.mean(), "sd(mu)", grid.sd());
  }

  /**
   * The sleep data of Cushny and Peebles (1905) as given by Student (1908): {@code y[i] ~
   * normal(mu, sigma)}, {@code mu ~ normal(0, 10)}, {@code sigma ~ half-normal(5)}.
   */
  private static Map<String, Double> sleepNormal(Path folder, int points) {
    double[] y = column(CsvData.read(folder.resolve("sleep.csv")), "difference");
    NormalDistribution muPrior = new NormalDistribution(null, 0, 10);
    NormalDistribution sigmaPrior = new NormalDistribution(null, 0, 5);
    DoubleBinaryOperator logPosterior =
        (mu, sigma) -> {
          if (!(sigma > 0)) {
            return Double.NEGATIVE_INFINITY;
          }
          double total = muPrior.logDensity(mu) + Math.log(2) + sigmaPrior.logDensity(sigma);
          NormalDistribution likelihood = new NormalDistribution(null, mu, sigma);
          for (double v : y) {
            total += likelihood.logDensity(v);
          }
          return total;
        };
    Quadrature.Grid2 grid = Quadrature.posterior2(logPosterior, -20, 20, 0, 30, points);
    return Map.of(
        "mean(mu)", grid.meanX(), "sd(mu)", grid.sdX(),
        "mean(sigma)", grid.meanY(), "sd(sigma)", grid.sdY());
  }

  /** The numbers of column {@code name}, in row order. */
  static double[] column(DataTable table, String name) {
    List<String> header = table.header();
    int k = header.indexOf(name);
    if (k < 0) {
      throw new IllegalArgumentException(
          table.fileName() + " must have a column '" + name + "', got " + header);
    }
    double[] values = new double[table.rows().size()];
    for (int r = 0; r < values.length; r++) {
      values[r] = Double.parseDouble(table.rows().get(r).cells().get(k).trim());
    }
    return values;
  }
}
