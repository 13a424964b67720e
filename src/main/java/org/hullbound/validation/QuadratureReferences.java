package org.hullbound.validation;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.function.DoubleBinaryOperator;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.CauchyDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.distribution.WeibullDistribution;
import org.hullbound.io.CsvData;
import org.hullbound.model.DataColumn;
import org.hullbound.model.DataTable;

/**
 * Reference values by numerical quadrature for the validation cases that have no closed form,
 * each case's model written again by hand in Java with commons-math3 log-densities.
 *
 * <p>Why by hand: a reference computed from hullbound's own compiled densities would share their
 * faults. Each reference below restates its case's {@code model.hbm} (the two must be kept in
 * step; {@code docs/validation.md} says so) and reads the same data files. Unknowns that a closed
 * form removes exactly are integrated out analytically (the school effects of the eight schools,
 * and the location given the scale in the two normal models); what is left is integrated on a
 * Simpson grid ({@link Quadrature}), or, for a scale whose posterior has a power-law tail, over its
 * whole range by Gauss-Legendre after a substitution ({@link ScaleMixture}).
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
    return Optional.of(folder -> compute(name, folder, POINTS_1D, POINTS_2D, 1, Double.POSITIVE_INFINITY));
  }

  /**
   * The same values computed another way, to check the integration error in tests: grids with
   * twice the resolution; for the cases integrated over a whole scale range, Gauss nodes placed
   * by a substitution whose midpoint sits at four times the scale.
   */
  static Map<String, Double> refined(String name, Path folder) {
    return compute(name, folder, 2 * POINTS_1D - 1, 2 * POINTS_2D - 1, 4, Double.POSITIVE_INFINITY);
  }

  /**
   * The values of a case integrated over a whole scale range ({@code eight_schools},
   * {@code sleep_normal}) with the scale cut at {@code upper}: to show in tests what the cut-off
   * tail is worth.
   */
  static Map<String, Double> withScaleCutAt(String name, Path folder, double upper) {
    if (!SCALE_MIXTURES.contains(name)) {
      throw new IllegalArgumentException(name + " is not integrated over a scale range");
    }
    return compute(name, folder, POINTS_1D, POINTS_2D, 1, upper);
  }

  private static final List<String> NAMES =
      List.of("eight_schools", "bliss_beetles", "darwin_student_t", "sleep_normal", "seal_lifetimes");

  private static final List<String> SCALE_MIXTURES = List.of("eight_schools", "sleep_normal");

  private static Map<String, Double> compute(
      String name, Path folder, int points1, int points2, double scaleFactor, double upper) {
    switch (name) {
      case "eight_schools":
        return eightSchools(folder, 25 * scaleFactor, upper);
      case "bliss_beetles":
        return blissBeetles(folder, points2);
      case "darwin_student_t":
        return darwinStudentT(folder, points1);
      case "seal_lifetimes":
        return sealLifetimes(folder, points2);
      default:
        return sleepNormal(folder, scaleFactor, upper);
    }
  }

  /**
   * Eight schools (Rubin 1981): {@code mu ~ normal(0, 50)}, {@code tau ~ half-cauchy(25)},
   * {@code theta[j] ~ normal(mu, tau)}, {@code y[j] ~ normal(theta[j], sigma[j])}. With the
   * thetas integrated out, {@code y[j] | mu, tau ~ normal(mu, sqrt(sigma[j]^2 + tau^2))} (Gelman
   * et al., BDA3, 5.4), and {@code mu} given {@code tau} is normal ({@link #normalMeanGivenScale});
   * {@code theta[1] | mu, tau, y} is normal with the precision-weighted mean
   * {@code (tau^2 y[1] + sigma[1]^2 mu) / (sigma[1]^2 + tau^2)}, linear in {@code mu}, so its
   * expectation given {@code tau} puts {@code mu}'s conditional mean in place of {@code mu}.
   */
  private static Map<String, Double> eightSchools(Path folder, double typicalScale, double upper) {
    DataTable table = CsvData.read(folder.resolve("schools.csv"));
    double[] y = column(table, "y");
    double[] sigma = column(table, "sigma");
    NormalDistribution muPrior = new NormalDistribution(null, 0, 50);
    CauchyDistribution tauPrior = new CauchyDistribution(null, 0, 25);
    ScaleMixture mixture =
        ScaleMixture.over(
            tau -> {
              double[] sd = new double[y.length];
              for (int j = 0; j < y.length; j++) {
                sd[j] = Math.sqrt(sigma[j] * sigma[j] + tau * tau);
              }
              return normalMeanGivenScale(tau, Math.log(2) + tauPrior.logDensity(tau), muPrior, y, sd);
            },
            typicalScale,
            upper);
    double firstVariance = sigma[0] * sigma[0];
    double theta1 =
        mixture.expectation(
            c -> {
              double tauSquared = c.scale() * c.scale();
              return (tauSquared * y[0] + firstVariance * c.mean()) / (firstVariance + tauSquared);
            });
    Map<String, Double> values = new LinkedHashMap<>();
    values.put("mean(mu)", mixture.meanMu());
    values.put("sd(mu)", mixture.sdMu());
    values.put("mean(tau)", mixture.meanScale());
    values.put("sd(tau)", mixture.sdScale());
    values.put("mean(theta[1])", theta1);
    return values;
  }

  /**
   * {@code mu ~ muPrior}, {@code y[j] ~ normal(mu, sd[j])}, the sds fixed by the scale: {@code mu}
   * given the scale is normal with precision {@code P = 1/A + sum 1/sd[j]^2} and mean
   * {@code m = (sum y[j]/sd[j]^2) / P} ({@code A} the prior variance, prior mean 0; BDA3 2.5), and
   * the integral over {@code mu} of a density Gaussian in {@code mu} is its value at the peak
   * {@code m} times {@code sqrt(2 pi / P)}: the scale's log-weight is the model's log-density at
   * {@code mu = m} plus {@code log sqrt(2 pi / P)}.
   */
  private static ScaleMixture.GivenScale normalMeanGivenScale(
      double scale, double logScalePrior, NormalDistribution muPrior, double[] y, double[] sd) {
    double priorVariance = muPrior.getStandardDeviation() * muPrior.getStandardDeviation();
    double precision = 1 / priorVariance;
    double weighted = muPrior.getMean() / priorVariance;
    for (int j = 0; j < y.length; j++) {
      precision += 1 / (sd[j] * sd[j]);
      weighted += y[j] / (sd[j] * sd[j]);
    }
    double m = weighted / precision;
    double logWeight = logScalePrior + muPrior.logDensity(m) + 0.5 * Math.log(2 * Math.PI / precision);
    for (int j = 0; j < y.length; j++) {
      logWeight += new NormalDistribution(null, m, sd[j]).logDensity(y[j]);
    }
    return new ScaleMixture.GivenScale(scale, logWeight, m, 1 / precision);
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
   * Pump seal lifetimes with right censoring (invented data): {@code hours[s] ~ weibull(shape,
   * scale)} for a failed seal, {@code P(X > hours[s])} for one still running ({@code running[s] =
   * 1}), {@code shape ~ gamma(2, rate 1)}, {@code scale ~ gamma(2, rate 0.25)}. A failed seal
   * adds commons-math3's {@code WeibullDistribution} log-density; a running one the log of the
   * Weibull survival function, {@code -(hours / scale)^shape} (Johnson, Kotz and Balakrishnan,
   * Continuous Univariate Distributions, vol. 1, 2nd ed., 1994, chapter 21, equation 21.3).
   */
  private static Map<String, Double> sealLifetimes(Path folder, int points) {
    DataTable table = CsvData.read(folder.resolve("seals.csv"));
    double[] hours = column(table, "hours");
    double[] running = column(table, "running");
    GammaDistribution shapePrior = new GammaDistribution(null, 2, 1);
    GammaDistribution scalePrior = new GammaDistribution(null, 2, 1 / 0.25);
    DoubleBinaryOperator logPosterior =
        (shape, scale) -> {
          if (!(shape > 0 && scale > 0)) {
            return Double.NEGATIVE_INFINITY;
          }
          double total = shapePrior.logDensity(shape) + scalePrior.logDensity(scale);
          WeibullDistribution lifetime = new WeibullDistribution(null, shape, scale);
          for (int s = 0; s < hours.length; s++) {
            total += running[s] == 1
                ? -Math.pow(hours[s] / scale, shape)
                : lifetime.logDensity(hours[s]);
          }
          return total;
        };
    Quadrature.Grid2 grid = Quadrature.posterior2(logPosterior, 1e-3, 8, 1e-3, 30, points);
    return Map.of(
        "mean(shape)", grid.meanX(), "sd(shape)", grid.sdX(),
        "mean(scale)", grid.meanY(), "sd(scale)", grid.sdY());
  }

  /**
   * The sleep data of Cushny and Peebles (1905) as given by Student (1908): {@code y[i] ~
   * normal(mu, sigma)}, {@code mu ~ normal(0, 10)}, {@code sigma ~ half-normal(5)}; {@code mu}
   * given {@code sigma} is normal ({@link #normalMeanGivenScale}).
   */
  private static Map<String, Double> sleepNormal(Path folder, double typicalScale, double upper) {
    double[] y = column(CsvData.read(folder.resolve("sleep.csv")), "difference");
    NormalDistribution muPrior = new NormalDistribution(null, 0, 10);
    NormalDistribution sigmaPrior = new NormalDistribution(null, 0, 5);
    ScaleMixture mixture =
        ScaleMixture.over(
            sigma -> {
              double[] sd = new double[y.length];
              Arrays.fill(sd, sigma);
              return normalMeanGivenScale(sigma, Math.log(2) + sigmaPrior.logDensity(sigma), muPrior, y, sd);
            },
            typicalScale,
            upper);
    return Map.of(
        "mean(mu)", mixture.meanMu(), "sd(mu)", mixture.sdMu(),
        "mean(sigma)", mixture.meanScale(), "sd(sigma)", mixture.sdScale());
  }

  /** The numbers of column {@code name}, in row order. */
  static double[] column(DataTable table, String name) {
    List<String> header = table.header();
    int k = header.indexOf(name);
    if (k < 0) {
      throw new IllegalArgumentException(
          table.fileName() + " must have a column '" + name + "', got " + header);
    }
    DataColumn column = table.column(k);
    double[] values = new double[table.rowCount()];
    for (int r = 0; r < values.length; r++) {
      if (Double.isNaN(column.value(r))) {
        throw new IllegalArgumentException(
            table.fileName() + ":" + table.line(r) + ": column '" + name + "' holds "
                + column.shown(r) + ", not a number");
      }
      values[r] = column.value(r);
    }
    return values;
  }
}
