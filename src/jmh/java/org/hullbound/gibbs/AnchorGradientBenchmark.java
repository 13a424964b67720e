package org.hullbound.gibbs;

import java.io.IOException;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.hullbound.anchor.FusedClinicsTarget;
import org.hullbound.anchor.ModelTarget;
import org.hullbound.anchor.Target;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * The cost of one gradient of the No-U-Turn anchor's target (value and gradient in one call, what
 * each leapfrog step pays): {@link ModelTarget} (the joint plus every full conditional's
 * derivative) against {@link FusedClinicsTarget} (the same density written
 * out by hand, one pass), on {@code clinics} (1,200 patients) and {@code clinics-grown} (120,000).
 * The ratio {@code model / fused} in one run is the factor by which the anchor's gradient is dearer
 * than a dedicated implementation's (docs/fit.md, "The anchor").
 *
 * <p>{@code target}: {@code model}; {@code fused} (patients of one clinic and dose summed into a
 * group, as hullbound's conditionals sum them: the fair comparison); {@code fused-rows} (each
 * patient a term of its own, the fused loop without that reduction). The position is the model's
 * initial state moved by a fixed 0.3 standard normal on every coordinate, one for the whole run
 * (the cost does not depend on it).
 *
 * <p>Run: {@code mvn -B -o -P bench -DskipTests package && java -jar target/benchmarks.jar
 * AnchorGradient} (one fork, 3 warm-up and 5 measured iterations of 1 s: about 40 s); add {@code
 * -prof gc} for the bytes allocated per gradient ({@code gc.alloc.rate.norm}), a figure the load
 * of the machine does not change.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Fork(1)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
public class AnchorGradientBenchmark {

  @Param({"clinics", "clinics-grown"})
  public String model;

  @Param({"model", "fused", "fused-rows"})
  public String target;

  private Target evaluated;
  private double[] position;
  private double[] gradient;

  @Setup
  public void setUp() throws IOException {
    LoadedModel loaded = LoadedModel.load(model);
    ModelTarget modelTarget = ModelTarget.of(loaded.bound());
    evaluated = switch (target) {
      case "model" -> modelTarget;
      case "fused" -> loaded.fusedClinics();
      case "fused-rows" -> FusedClinicsTarget.rowByRow(loaded.bound(), loaded.data());
      default -> throw new IllegalArgumentException(
          "target must be model, fused or fused-rows, got " + target);
    };
    position = modelTarget.toSamplingScale(loaded.bound().initialState());
    SplittableRandom random = new SplittableRandom(20261203L);
    for (int i = 0; i < position.length; i++) {
      position[i] += 0.3 * random.nextGaussian();
    }
    gradient = new double[position.length];
  }

  @Benchmark
  public double gradient() {
    return evaluated.logDensity(position, gradient) + gradient[0];
  }
}
