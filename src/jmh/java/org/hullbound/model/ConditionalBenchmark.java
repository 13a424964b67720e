package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.hullbound.lang.Parser;
import org.hullbound.model.family.LogSpace;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;

/**
 * The compiled full conditional of one group effect in a logistic random-effects model against
 * the same conditional written by hand in Java: a normal prior and {@code perGroup} Bernoulli
 * terms with {@code logit_p = alpha + offset[obs] + effect[group]}, value and derivative in one
 * call. With {@code predictors = shared} every offset is 0, so the rows of a group share one
 * linear predictor and the compiled conditional sums them once by their sufficient statistics
 * (docs/model-compilation.md, "Rows of one linear predictor, summed once"), which the loops by
 * hand do not; with {@code predictors = distinct} every row has its own offset, so every side
 * does the same arithmetic per row and the ratio is the per-term cost that issue 12's goal names.
 *
 * <p>Five scores, each one call (the per-term cost is a score divided by {@code perGroup + 1}):
 *
 * <ul>
 *   <li>{@code conditionalCompiled}: the compiled conditional within one draw (the other unknowns
 *       keep their values, so the parts of each term free of the unknown are kept from the
 *       draw's first evaluation);
 *   <li>{@code conditionalCompiledNewDraw}: the same when every call is the first of a draw
 *       ({@code alpha} changes between calls, so every part is worked out again): the worst case;
 *   <li>{@code conditionalFromScratch}: the same evaluated as before issue 12, every part a
 *       compiled tree at every call and a fresh frame per call;
 *   <li>{@code conditionalHandWritten}: the same arithmetic by hand, reading {@code alpha} from
 *       the state;
 *   <li>{@code conditionalHandFused}: the practical floor (issue 12), one fused loop over
 *       primitive arrays of each term's intercept, slope and outcome, doing the family's
 *       arithmetic ({@code x log expit(eta) + (1 - x) log expit(-eta)}, slope {@code x -
 *       expit(eta)}, as {@code model.family.Binomial} does: all three from one {@code
 *       exp(-|eta|)} and one {@code log1p}) and nothing else.
 * </ul>
 *
 * <p>Run: {@code mvn -B -o -P bench -DskipTests package && java -jar target/benchmarks.jar
 * Conditional -f 1 -wi 3 -i 5 -w 1 -r 1}. The ratios of the scores in one run are what count
 * (the machine is shared); issue 12's goal is compiled / hand-fused at most 1.5.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
public class ConditionalBenchmark {

  private static final int GROUPS = 4;

  @Param({"200", "5000"})
  public int perGroup;

  @Param({"distinct", "shared"})
  public String predictors;

  private ConditionalDensity compiled;
  private double[] state;
  private double[] slope;
  private int alphaSlot;
  private int spreadSlot;
  private double[] ownGroup;
  private double[] ownOffsets;
  private double[] points;
  private int next;
  /** Per term of the fused loop: intercept, slope of the linear predictor in the unknown, outcome. */
  private double[] fusedIntercepts;
  private double[] fusedSlopes;
  private double[] fusedOutcomes;

  @Setup
  public void setUp() {
    String model =
        String.join(
            "\n",
            "index group = 1 .. " + GROUPS,
            "index obs",
            "data  group_of[obs], offset[obs]",
            "data  y[obs] ~ bernoulli(logit_p = alpha + offset[obs] + effect[group_of[obs]])",
            "param alpha ~ normal(mean = 0, sd = 2)",
            "param spread ~ half-normal(sd = 1)",
            "param effect[group] ~ normal(mean = 0, sd = spread)");
    SplittableRandom random = new SplittableRandom(7);
    List<List<String>> rows = new ArrayList<>();
    List<Double> first = new ArrayList<>();
    List<Double> firstOffsets = new ArrayList<>();
    boolean distinct = predictors.equals("distinct");
    for (int i = 0; i < perGroup * GROUPS; i++) {
      int group = 1 + i % GROUPS;
      int y = random.nextDouble() < 0.6 ? 1 : 0;
      double offset = distinct ? random.nextDouble() - 0.5 : 0.0;
      rows.add(List.of(Integer.toString(group), Double.toString(offset), Integer.toString(y)));
      if (group == 1) {
        first.add((double) y);
        firstOffsets.add(offset);
      }
    }
    BoundModel bound =
        BoundModel.bind(
            Parser.parse("bench.hbm", model),
            List.of(DataTable.of("obs.csv", List.of("group_of", "offset", "y"), rows)));
    Unknown effect = bound.unknown("effect[1]");
    compiled = bound.conditional(effect.index());
    if (compiled.termCount() != perGroup + 1) {
      throw new IllegalStateException("expected " + (perGroup + 1) + " terms, got " + compiled.termCount());
    }
    state = bound.initialState();
    alphaSlot = bound.unknown("alpha").index();
    spreadSlot = bound.unknown("spread").index();
    state[alphaSlot] = 0.3;
    state[spreadSlot] = 0.8;
    ownGroup = first.stream().mapToDouble(Double::doubleValue).toArray();
    ownOffsets = firstOffsets.stream().mapToDouble(Double::doubleValue).toArray();
    points = new double[] {-1.2, -0.4, 0.1, 0.7, 1.5};
    slope = new double[1];
    fusedIntercepts = new double[ownGroup.length];
    fusedSlopes = new double[ownGroup.length];
    fusedOutcomes = ownGroup.clone();
    for (int i = 0; i < ownOffsets.length; i++) {
      fusedIntercepts[i] = state[alphaSlot] + ownOffsets[i];
    }
    java.util.Arrays.fill(fusedSlopes, 1.0);
    // Every side compute the same full log-density (constants included) and slope.
    double[] other = new double[1];
    double a = compiled.logDensity(0.5, state, slope);
    double b = handWritten(0.5, state, other);
    if (Math.abs(a - b) > 1e-9 * Math.abs(b) || Math.abs(slope[0] - other[0]) > 1e-9 * (1
        + Math.abs(other[0]))) {
      throw new IllegalStateException("compiled " + a + ", " + slope[0] + " but by hand " + b
          + ", " + other[0]);
    }
    double c = handFused(0.5, other);
    if (Math.abs(a - c) > 1e-9 * Math.abs(c) || Math.abs(slope[0] - other[0]) > 1e-9 * (1
        + Math.abs(other[0]))) {
      throw new IllegalStateException("compiled " + a + ", " + slope[0] + " but fused " + c
          + ", " + other[0]);
    }
  }

  @Benchmark
  public double conditionalCompiledNewDraw() {
    double u = points[next++ % points.length];
    // Another alpha at every call: each evaluation is the first of its draw.
    state[alphaSlot] = (next & 1) == 0 ? 0.3 : 0.30000000000000004;
    return compiled.logDensity(u, state, slope) + slope[0];
  }

  @Benchmark
  public double conditionalFromScratch() {
    double u = points[next++ % points.length];
    return ((CompiledConditional) compiled).logDensityFromScratch(u, state, slope) + slope[0];
  }

  @Benchmark
  public double conditionalHandFused() {
    double u = points[next++ % points.length];
    return handFused(u, slope) + slope[0];
  }

  /**
   * The floor: the prior, then one loop over primitive arrays with the family's own arithmetic
   * ({@code LogSpace.log1pExp} of the predictor or its negation for {@code -log expit}, and {@code
   * LogSpace.invLogit} for the slope, all from one {@code e = exp(-|eta|)}), each predictor {@code
   * a + b x}.
   */
  private double handFused(double effect, double[] slope) {
    double sd = state[spreadSlot];
    double z = effect / sd;
    double value = -0.5 * z * z - Math.log(sd) - 0.9189385332046728;
    double derivative = -z / sd;
    double[] a = fusedIntercepts;
    double[] b = fusedSlopes;
    double[] y = fusedOutcomes;
    for (int i = 0; i < y.length; i++) {
      double eta = a[i] + b[i] * effect;
      double e = Math.exp(-Math.abs(eta));
      value -= y[i] == 1 ? LogSpace.log1pExp(-eta, e) : LogSpace.log1pExp(eta, e);
      derivative += (y[i] - LogSpace.invLogit(eta, e)) * b[i];
    }
    slope[0] = derivative;
    return value;
  }

  @Benchmark
  public double conditionalCompiled() {
    double u = points[next++ % points.length];
    return compiled.logDensity(u, state, slope) + slope[0];
  }

  @Benchmark
  public double conditionalHandWritten() {
    double u = points[next++ % points.length];
    return handWritten(u, state, slope) + slope[0];
  }

  /** The same conditional by hand: normal(0, spread) prior plus Bernoulli log-likelihoods. */
  private double handWritten(double effect, double[] state, double[] slope) {
    double alpha = state[alphaSlot];
    double sd = state[spreadSlot];
    double z = effect / sd;
    double value = -0.5 * z * z - Math.log(sd) - 0.9189385332046728;
    double derivative = -z / sd;
    for (int i = 0; i < ownGroup.length; i++) {
      double y = ownGroup[i];
      double eta = alpha + ownOffsets[i] + effect;
      // log expit(eta) = -log1p(exp(-eta)), computed stably on both sides.
      double softplus = eta > 0 ? eta + Math.log1p(Math.exp(-eta)) : Math.log1p(Math.exp(eta));
      value += y * eta - softplus;
      double p = eta > 0 ? 1 / (1 + Math.exp(-eta)) : Math.exp(eta) / (1 + Math.exp(eta));
      derivative += y - p;
    }
    slope[0] = derivative;
    return value;
  }
}
