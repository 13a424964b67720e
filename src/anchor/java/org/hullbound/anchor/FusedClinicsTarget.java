package org.hullbound.anchor;

import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataColumn;
import org.hullbound.model.DataTable;
import org.hullbound.model.Unknown;
import org.hullbound.model.family.LogSpace;
import org.hullbound.model.family.Scale;

/**
 * The posterior of the {@code clinics} model ({@code models/clinics.hbm} and its grown twin)
 * written out by hand: the joint log-density and its gradient in one pass over primitive arrays,
 * what a practitioner's dedicated gradient (reverse mode over the joint, or these lines written
 * out) costs, against {@link ModelTarget}'s vector of full conditionals. Same coordinates as {@link
 * ModelTarget} (the model's unknown order; the spread on the log scale with its Jacobian {@code u},
 * the rest as they are) and the same value up to one additive constant (the normalising constants
 * of the priors left out here), so that the No-U-Turn sampler moves on the same density on either.
 *
 * <p>The density: {@code intercept ~ normal(0, 2)}, {@code slope ~ normal(0, 1)}, {@code spread =
 * exp(u) ~ half-normal(1)}, {@code effect[c] ~ normal(0, spread)} for each of the {@code C}
 * clinics, and {@code recovered ~ bernoulli(expit(eta))} with {@code eta = intercept + slope * dose
 * + effect[clinic_of]}. Up to a constant, with {@code s = exp(u)}:
 *
 * <pre>
 *   -intercept^2 / 8 - slope^2 / 2 - s^2 / 2 + u - C u - sum_c effect[c]^2 / (2 s^2)
 *     + sum_g (y_g eta_g - n_g log(1 + exp(eta_g)))
 * </pre>
 *
 * and its derivative in {@code eta_g} is {@code y_g - n_g expit(eta_g)}, summed into the intercept,
 * the slope (times the dose) and the clinic's effect. A group {@code g} is either one patient
 * ({@link #rowByRow}) or all patients of one clinic with one dose ({@link #of}): the Bernoulli
 * likelihood of a group is that of its success count {@code y_g} of {@code n_g} up to the binomial
 * coefficient, a constant. That is the reduction {@code hullbound}'s conditionals make (rows with
 * the same linear predictor evaluated once by their sufficient statistics), open to any
 * implementation that looks at the data first, so the comparison against {@link #of} is the fair
 * one; {@link #rowByRow} is the plain one. Each group costs one exponential and one {@code log1p}
 * ({@link LogSpace#log1pExp(double, double)} and the expit share {@code exp(-|eta|)}).
 *
 * <p>Keeps scratch space: one instance per chain.
 */
public final class FusedClinicsTarget implements Target {
  private final int dimension;
  private final int intercept;
  private final int slope;
  private final int spread;
  /** The coordinate of each clinic's effect, clinic 0-based. */
  private final int[] effectOf;
  /** Groups sorted by clinic: clinic {@code c}'s are {@code clinicStart[c]} to {@code [c + 1]}. */
  private final int[] clinicStart;
  private final double[] dose;
  private final double[] successes;
  private final double[] trials;

  private FusedClinicsTarget(int dimension, int intercept, int slope, int spread, int[] effectOf,
      int[] clinicStart, double[] dose, double[] successes, double[] trials) {
    this.dimension = dimension;
    this.intercept = intercept;
    this.slope = slope;
    this.spread = spread;
    this.effectOf = effectOf;
    this.clinicStart = clinicStart;
    this.dose = dose;
    this.successes = successes;
    this.trials = trials;
  }

  /**
   * The target of {@code model} (the clinics model, any number of clinics) on {@code data} (columns
   * {@code clinic_of}, {@code dose}, {@code recovered}, the table the model was bound to), the
   * patients of one clinic and one dose summed into one group.
   *
   * @throws IllegalArgumentException when the model's unknowns are not the clinics model's or the
   *     data lack a column or hold a clinic, dose or outcome out of range
   */
  public static FusedClinicsTarget of(BoundModel model, DataTable data) {
    return build(model, data, true);
  }

  /** As {@link #of}, each patient a group of its own (no data reduction). */
  public static FusedClinicsTarget rowByRow(BoundModel model, DataTable data) {
    return build(model, data, false);
  }

  /** The number of groups summed at each evaluation. */
  public int groupCount() {
    return dose.length;
  }

  private static FusedClinicsTarget build(BoundModel model, DataTable data, boolean grouped) {
    if (model == null || data == null) {
      throw new IllegalArgumentException("model and data must not be null");
    }
    List<Unknown> unknowns = model.unknowns();
    Map<String, Integer> indexOf = new HashMap<>();
    for (Unknown u : unknowns) {
      indexOf.put(u.label(), u.index());
    }
    int clinics = unknowns.size() - 3;
    int[] effectOf = new int[Math.max(clinics, 0)];
    for (int c = 0; c < clinics; c++) {
      effectOf[c] = coordinate(indexOf, "effect[" + (c + 1) + "]");
    }
    int intercept = coordinate(indexOf, "intercept");
    int slope = coordinate(indexOf, "slope");
    int spread = coordinate(indexOf, "spread");
    if (model.conditional(spread).scale() != Scale.LOG) {
      throw new IllegalArgumentException("spread must be sampled on the log scale");
    }
    DataColumn clinicColumn = column(data, "clinic_of");
    DataColumn doseColumn = column(data, "dose");
    DataColumn outcomeColumn = column(data, "recovered");

    // the group's number in first-seen order by (clinic, dose)
    Map<GroupKey, Integer> groupOf = new HashMap<>();
    int rows = data.rowCount();
    int[] groupClinic = new int[rows];
    double[] groupDose = new double[rows];
    double[] groupSuccesses = new double[rows];
    double[] groupTrials = new double[rows];
    int groups = 0;
    int[] perClinic = new int[clinics + 1];
    for (int row = 0; row < rows; row++) {
      double clinicValue = clinicColumn.value(row);
      double x = doseColumn.value(row);
      double y = outcomeColumn.value(row);
      int clinic = (int) clinicValue - 1;
      if (clinicValue != clinic + 1 || clinic < 0 || clinic >= clinics || !Double.isFinite(x)
          || !(y == 0 || y == 1)) {
        throw new IllegalArgumentException(data.fileName() + " line " + data.line(row)
            + ": expected a clinic in 1.." + clinics + ", a finite dose and an outcome 0 or 1");
      }
      int g = groups;
      if (grouped) {
        Integer seen = groupOf.putIfAbsent(new GroupKey(clinic, x + 0.0), groups);
        g = seen == null ? groups : seen;
      }
      if (g == groups) {
        groupClinic[g] = clinic;
        groupDose[g] = x;
        groups++;
        perClinic[clinic + 1]++;
      }
      groupSuccesses[g] += y;
      groupTrials[g] += 1;
    }
    // counting sort by clinic, first-seen order kept within a clinic
    int[] clinicStart = perClinic.clone();
    for (int c = 0; c < clinics; c++) {
      clinicStart[c + 1] += clinicStart[c];
    }
    int[] next = Arrays.copyOf(clinicStart, clinics);
    double[] dose = new double[groups];
    double[] successes = new double[groups];
    double[] trials = new double[groups];
    for (int g = 0; g < groups; g++) {
      int at = next[groupClinic[g]]++;
      dose[at] = groupDose[g];
      successes[at] = groupSuccesses[g];
      trials[at] = groupTrials[g];
    }
    return new FusedClinicsTarget(unknowns.size(), intercept, slope, spread, effectOf, clinicStart,
        dose, successes, trials);
  }

  /** A clinic and a dose (-0 taken as 0). */
  private record GroupKey(int clinic, double dose) {}

  private static int coordinate(Map<String, Integer> indexOf, String label) {
    Integer index = indexOf.get(label);
    if (index == null) {
      throw new IllegalArgumentException(
          "the model must have the clinics model's unknowns, missing " + label);
    }
    return index;
  }

  private static DataColumn column(DataTable data, String name) {
    int j = data.header().indexOf(name);
    if (j < 0 || !data.holds(j)) {
      throw new IllegalArgumentException(data.fileName() + " has no column " + name);
    }
    return data.column(j);
  }

  @Override
  public int dimension() {
    return dimension;
  }

  @Override
  public double logDensity(double[] position, double[] gradient) {
    double a = position[intercept];
    double b = position[slope];
    double u = position[spread];
    double precision = Math.exp(-2 * u);
    int clinics = effectOf.length;
    double value = -a * a / 8 - b * b / 2 - 0.5 / precision + u - clinics * u;
    double gradientA = -a / 4;
    double gradientB = -b;
    double squares = 0;
    for (int c = 0; c < clinics; c++) {
      double effect = position[effectOf[c]];
      squares += effect * effect;
      double offset = a + effect;
      double gradientEffect = 0;
      for (int g = clinicStart[c], end = clinicStart[c + 1]; g < end; g++) {
        double x = dose[g];
        double eta = offset + b * x;
        double e = Math.exp(-Math.abs(eta));
        double expit = eta >= 0 ? 1 / (1 + e) : e / (1 + e);
        double n = trials[g];
        double y = successes[g];
        value += y * eta - n * LogSpace.log1pExp(eta, e);
        double residual = y - n * expit;
        gradientEffect += residual;
        gradientB += residual * x;
      }
      gradientA += gradientEffect;
      gradient[effectOf[c]] = gradientEffect - effect * precision;
    }
    value -= 0.5 * squares * precision;
    if (!(value > Double.NEGATIVE_INFINITY) || value == Double.POSITIVE_INFINITY) {
      return Double.NEGATIVE_INFINITY;
    }
    gradient[intercept] = gradientA;
    gradient[slope] = gradientB;
    // d/du of -exp(2u)/2 + u - C u - squares exp(-2u) / 2
    gradient[spread] = -1 / precision + 1 - clinics + squares * precision;
    return value;
  }
}
