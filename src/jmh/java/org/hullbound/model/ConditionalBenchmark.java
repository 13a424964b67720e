package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.hullbound.lang.Parser;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;

/**
 * The compiled full conditional of one group effect in a logistic random-effects model against
 * the same conditional written by hand in Java: a normal prior and 200 Bernoulli terms with
 * {@code logit_p = alpha + effect[group]}, value and derivative in one call.
 *
 * <p>Run: {@code mvn -B -o -P bench -DskipTests package && java -jar target/benchmarks.jar
 * Conditional -f 1 -wi 3 -i 5 -w 1 -r 1}. The ratio of the two scores is what counts (the
 * machine is shared); the target is compiled / hand-written within 3.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
public class ConditionalBenchmark {

  private static final int PER_GROUP = 200;
  private static final int GROUPS = 4;

  private ConditionalDensity compiled;
  private double[] state;
  private double[] slope;
  private int alphaSlot;
  private int spreadSlot;
  private double[] ownGroup;
  private double[] points;
  private int next;

  @Setup
  public void setUp() {
    String model =
        String.join(
            "\n",
            "index group = 1 .. " + GROUPS,
            "index obs",
            "data  group_of[obs]",
            "data  y[obs] ~ bernoulli(logit_p = alpha + effect[group_of[obs]])",
            "param alpha ~ normal(mean = 0, sd = 2)",
            "param spread ~ half-normal(sd = 1)",
            "param effect[group] ~ normal(mean = 0, sd = spread)");
    SplittableRandom random = new SplittableRandom(7);
    List<List<String>> rows = new ArrayList<>();
    List<Double> first = new ArrayList<>();
    for (int i = 0; i < PER_GROUP * GROUPS; i++) {
      int group = 1 + i % GROUPS;
      int y = random.nextDouble() < 0.6 ? 1 : 0;
      rows.add(List.of(Integer.toString(group), Integer.toString(y)));
      if (group == 1) {
        first.add((double) y);
      }
    }
    BoundModel bound =
        BoundModel.bind(
            Parser.parse("bench.hbm", model),
            List.of(DataTable.of("obs.csv", List.of("group_of", "y"), rows)));
    Unknown effect = bound.unknown("effect[1]");
    compiled = bound.conditional(effect.index());
    if (compiled.termCount() != PER_GROUP + 1) {
      throw new IllegalStateException("expected 201 terms, got " + compiled.termCount());
    }
    state = bound.initialState();
    alphaSlot = bound.unknown("alpha").index();
    spreadSlot = bound.unknown("spread").index();
    state[alphaSlot] = 0.3;
    state[spreadSlot] = 0.8;
    ownGroup = first.stream().mapToDouble(Double::doubleValue).toArray();
    points = new double[] {-1.2, -0.4, 0.1, 0.7, 1.5};
    slope = new double[1];
    // Both sides compute the same full log-density (constants included) and slope.
    double[] other = new double[1];
    double a = compiled.logDensity(0.5, state, slope);
    double b = handWritten(0.5, state, other);
    if (Math.abs(a - b) > 1e-9 * Math.abs(b) || Math.abs(slope[0] - other[0]) > 1e-9 * (1
        + Math.abs(other[0]))) {
      throw new IllegalStateException("compiled " + a + ", " + slope[0] + " but by hand " + b
          + ", " + other[0]);
    }
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
    for (double y : ownGroup) {
      double eta = alpha + effect;
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
