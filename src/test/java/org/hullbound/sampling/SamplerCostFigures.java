package org.hullbound.sampling;

import java.util.Arrays;
import java.util.function.DoubleSupplier;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.random.Well19937c;

/**
 * Prints the cost counts quoted in docs/sampling.md (log-density evaluations per transition,
 * acceptance and rejection rates), read from the samplers' statistics records, each over 100000
 * transitions from exact starts. Not a test and not a speed measurement: run it by hand, see
 * docs/sampling.md for the command.
 */
public final class SamplerCostFigures {
  private static final double INF = Double.POSITIVE_INFINITY;
  private static final int N = 100_000;

  private SamplerCostFigures() {}

  public static void main(String[] args) {
    NormalDistribution standard = new NormalDistribution(new Well19937c(1), 0, 1);
    DoubleUnaryOperator normal = x -> -0.5 * x * x;
    for (double width : new double[] {0.5, 1, 2.5, 10}) {
      SliceSampler slice = SliceSampler.of(normal, -INF, INF, width, 50);
      run(slice, standard::sample);
      System.out.printf("slice, N(0,1), w = %.1f: %.2f evaluations per transition%n", width,
          slice.statistics().evaluationsPerTransition());
    }

    NormalDistribution first = new NormalDistribution(-3, 1);
    NormalDistribution second = new NormalDistribution(2, 0.5);
    DoubleUnaryOperator mixture =
        x -> Math.log(0.3 * first.density(x) + 0.7 * second.density(x));
    NormalDistribution firstDraws = new NormalDistribution(new Well19937c(4), -3, 1);
    NormalDistribution secondDraws = new NormalDistribution(new Well19937c(5), 2, 0.5);
    Well19937c pick = new Well19937c(3);
    DoubleSupplier mixtureDraw =
        () -> pick.nextDouble() < 0.3 ? firstDraws.sample() : secondDraws.sample();
    for (double[] points : new double[][] {{-4, -2, 0, 1.5, 2.5}, {1.5, 2, 2.5}}) {
      AdaptiveRejectionMetropolis arms =
          AdaptiveRejectionMetropolis.of(mixture, -INF, INF, points, 30);
      run(arms, mixtureDraw);
      ArmsStatistics s = arms.statistics();
      System.out.printf("ARMS, mixture, points %s: %.2f evaluations per transition, "
              + "Metropolis rejection rate %.3f, adaptive rejections per transition %.2f, "
              + "largest envelope %d%n", Arrays.toString(points), s.evaluationsPerTransition(),
          (double) s.metropolisRejections() / N, (double) s.adaptiveRejections() / N,
          s.largestEnvelope());
    }
    AdaptiveRejectionMetropolis armsNormal =
        AdaptiveRejectionMetropolis.of(normal, -INF, INF, new double[] {-1, 0, 1}, 30);
    run(armsNormal, standard::sample);
    System.out.printf("ARMS, N(0,1), points [-1, 0, 1]: %.2f evaluations per transition, "
            + "%d Metropolis rejections%n", armsNormal.statistics().evaluationsPerTransition(),
        armsNormal.statistics().metropolisRejections());
    SliceSampler sliceMixture = SliceSampler.of(mixture, -INF, INF, 2, 50);
    run(sliceMixture, mixtureDraw);
    System.out.printf("slice, mixture, w = 2: %.2f evaluations per transition%n",
        sliceMixture.statistics().evaluationsPerTransition());
    RandomWalkMetropolis metropolis = RandomWalkMetropolis.of(normal, -INF, INF, 2.4);
    run(metropolis, standard::sample);
    System.out.printf("random-walk Metropolis, N(0,1), step 2.4: acceptance %.4f%n",
        metropolis.statistics().acceptanceRate());

    double q5 = standard.cumulativeProbability(-5);
    DoubleUnaryOperator tail = x -> -0.5 * x * x - 0.5 * Math.log(2 * Math.PI) - Math.log(q5);
    for (double rate : new double[] {1, (5 + Math.sqrt(29)) / 2}) {
      FixedEnvelopeRejection rejection = FixedEnvelopeRejection.withComputedBound(
          tail, 5, INF, Proposal.exponentialTail(5, rate));
      var rng = MarkovChecks.rng(8);
      for (int i = 0; i < N; i++) {
        rejection.sample(rng);
      }
      System.out.printf("rejection, N(0,1) beyond 5, proposal 5 + Exp(%.4f): M = %.5f, "
              + "expected acceptance %.4f, observed %.4f%n", rate, rejection.bound(),
          rejection.expectedAcceptance(), rejection.statistics().acceptanceRate());
    }
  }

  private static void run(MarkovTransition transition, DoubleSupplier exactDraw) {
    var rng = MarkovChecks.rng(2);
    for (int i = 0; i < N; i++) {
      transition.next(exactDraw.getAsDouble(), rng);
    }
  }
}
