package org.hullbound.anchor;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.random.RandomGenerator;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.gibbs.ChainKernel;
import org.hullbound.gibbs.ChainSeeds;
import org.hullbound.gibbs.ModelSampler;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/**
 * On the {@code clinics} demo (39 unknowns: intercept, slope, the spread on the log scale and 36
 * clinic effects) the No-U-Turn anchor and hullbound's Gibbs sampler (moves on) agree: for every
 * unknown the difference of the two posterior means lies within 4.70 combined MCSE, {@code
 * sqrt(mcse_anchor^2 + mcse_gibbs^2)}; and so does the anchor moving on the hand-fused target
 * ({@link FusedClinicsTarget}, its gradient in one pass, summed over (clinic, dose) groups in
 * another order than the model's, so its draws are not the model target's bit for bit). Two exact
 * samplers of one posterior differ by chance only, with a normal level of 2.6e-6 each (two-sided,
 * z = 4.70), 2e-4 for the 78 together (Bonferroni; the level rests on the MCSEs being accurate,
 * Vehtari et al. 2021).
 *
 * <p>Sized to stay fast (about 7 s of CPU for each sampler on the busy machine, run on two
 * threads; the fused anchor about 1 s): each anchor one chain of 300 warm-up and 1000 kept
 * iterations (about 13 gradients each), Gibbs two chains of 300 burn-in and 2000 kept sweeps; seed
 * 20261202 split four ways. Power: the weakest mean is the
 * spread's, with MCSE 0.0063 (anchor, ess about 270 of its posterior sd 0.11) and 0.0024 (Gibbs,
 * ess about 1900), 0.0067 combined, so a bias of 0.04 in its mean (0.4 posterior sd) is caught
 * with probability about 0.9. Broken on purpose (the leapfrog's second momentum half-step of the
 * wrong sign), 12 of the 39 means failed (the spread 0.33 against 0.49, z = -20). With the
 * log-Jacobian left out of the target's value this test passed: that moves the spread's mean by
 * about -var / mean = -0.02, 3 combined MCSE, below its reach; {@code ModelTargetTest} and {@code
 * CorrelatedNormalTest} fail on that break. The fused target broken on purpose in value and
 * gradient alike (the effects' prior precision {@code exp(-u)} for {@code exp(-2u)}: another,
 * improper, posterior), 37 of the fused anchor's 39 means failed (the spread 0.00 against 0.49). A
 * wrong gradient alone leaves NUTS exact (the leapfrog stays reversible and volume-preserving) and
 * is {@code FusedClinicsTargetTest}'s to catch.
 */
class ClinicsAgreementTest {
  private static final double Z = 4.70;

  @Test
  void anchorAndGibbsAgreeOnEveryMean() {
    BoundModel model = AnchorModels.demo("clinics");
    int n = model.unknowns().size();
    RandomGenerator[] generators = ChainSeeds.split(20261202L, 4);

    // depth at most 6 (64 steps; clinics needs about 4 doublings): a broken integrator then fails
    // in bounded time instead of running 1024 steps an iteration
    AnchorKernel anchor =
        AnchorKernel.of(model, null, new NoUTurnSampler.Settings(300, 0.8, 6));
    // the anchor on a second thread while the Gibbs chains run on this one (two cores)
    CompletableFuture<double[][][]> anchorRun =
        CompletableFuture.supplyAsync(() -> run(anchor, generators[0], 300, 1000));
    AnchorKernel fused = AnchorKernel.of(model,
        FusedClinicsTarget.of(model, AnchorModels.demoData("clinics")), null,
        new NoUTurnSampler.Settings(300, 0.8, 6));
    CompletableFuture<double[][][]> fusedRun =
        CompletableFuture.supplyAsync(() -> run(fused, generators[3], 300, 1000));

    ModelSampler gibbs = ModelSampler.of(model, Map.of());
    double[][][] gibbsDraws = new double[n][2][];
    for (int chain = 0; chain < 2; chain++) {
      ChainKernel kernel = gibbs.sampler().withAdaptation(300)
          .newChain(chain, generators[1 + chain]);
      double[][][] one = run(kernel, generators[1 + chain], 300, 2000);
      for (int i = 0; i < n; i++) {
        gibbsDraws[i][chain] = one[i][0];
      }
    }

    List<String> failures = new ArrayList<>();
    compare(model, "anchor", anchorRun.join(), gibbsDraws, failures);
    compare(model, "fused anchor", fusedRun.join(), gibbsDraws, failures);
    assertEquals(List.of(), failures, "means more than " + Z + " combined MCSE apart");
    assertEquals(1000, anchor.statistics().iterations());
    assertEquals(1000, fused.statistics().iterations());
  }

  private static void compare(BoundModel model, String name, double[][][] anchorDraws,
      double[][][] gibbsDraws, List<String> failures) {
    for (int i = 0; i < anchorDraws.length; i++) {
      String label = model.unknowns().get(i).label();
      VariableSummary a = PosteriorSummary.of(label, anchorDraws[i]);
      VariableSummary g = PosteriorSummary.of(label, gibbsDraws[i]);
      double combined = Math.hypot(a.mcseMean(), g.mcseMean());
      double z = (a.mean() - g.mean()) / combined;
      if (!(Math.abs(z) < Z)) {
        failures.add(String.format(Locale.ROOT, "%s: %s %.4f, gibbs %.4f, z %.2f",
            label, name, a.mean(), g.mean(), z));
      }
    }
  }

  /** Draws [unknown][1][kept] of {@code kernel} after {@code warmup} sweeps. */
  private static double[][][] run(ChainKernel kernel, RandomGenerator rng, int warmup, int kept) {
    double[][][] draws = new double[kernel.width()][1][kept];
    double[] row = new double[kernel.width()];
    for (int sweep = 0; sweep < warmup + kept; sweep++) {
      kernel.sweep(rng);
      if (sweep >= warmup) {
        kernel.record(row);
        for (int i = 0; i < row.length; i++) {
          draws[i][0][sweep - warmup] = row[i];
        }
      }
    }
    return draws;
  }
}
