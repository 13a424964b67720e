package org.hullbound.validation;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGenerator.SplittableGenerator;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.ModelFile;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.hullbound.model.PriorSimulation;
import org.hullbound.model.SimulationException;

/**
 * Simulation-based calibration (Talts, Betancourt, Simpson, Vehtari and Gelman 2018, "Validating
 * Bayesian inference algorithms with simulation-based calibration", arXiv:1804.06788, algorithm
 * 1): if the sampler is exact, the rank of a prior draw among posterior draws given data simulated
 * from it is uniform on 0 .. L.
 *
 * <p>Why: it checks the whole chain of model compilation, update choice and sampling on the
 * user's own model, not only on the suite's cases. Steps per replicate n = 1 .. N, as in the
 * paper: (1) draw the unknowns from the prior; (2) simulate the modelled data from the likelihood
 * given them, covariates and index data staying as in the user's files; (3) fit the model to the
 * simulated data, keeping L thinned draws; (4) record the rank of each prior draw among its
 * posterior draws (ties, possible for missing counts, broken at random). Then each unknown's ranks
 * are tested for uniformity ({@link RankUniformity}).
 */
public final class Calibration {
  private static final String ALGORITHM = "L64X128MixRandom";

  private final ModelFile model;
  private final List<DataTable> tables;
  private final BoundModel bound;
  private final PosteriorFitter fitter;

  private Calibration(ModelFile model, List<DataTable> tables, BoundModel bound, PosteriorFitter fitter) {
    this.model = model;
    this.tables = tables;
    this.bound = bound;
    this.fitter = fitter;
  }

  /**
   * Calibration of {@code model} with its data {@code tables} (which supply covariates, index sizes
   * and the places of the modelled data), fitted by {@code fitter}.
   *
   * @throws ModelException when the model does not bind to the tables
   * @throws SimulationException when the model cannot be simulated: it has no unknowns, or a
   *     modelled data name is read by other statements
   */
  public static Calibration of(ModelFile model, List<DataTable> tables, PosteriorFitter fitter) {
    if (model == null || tables == null || fitter == null) {
      throw new IllegalArgumentException("model, tables and fitter must not be null");
    }
    BoundModel bound = BoundModel.bind(model, tables);
    if (bound.unknowns().isEmpty()) {
      throw new SimulationException("model " + bound.name() + " has no unknowns to calibrate");
    }
    List<String> readElsewhere = SimulatedData.modelledDataReadElsewhere(model);
    if (!readElsewhere.isEmpty()) {
      throw new SimulationException(
          "cannot simulate model " + bound.name() + ": modelled data " + readElsewhere
              + " also appear in other statements, which binding fixes at their observed values;"
              + " calibrate a model in which modelled data appear only on their own ~ line");
    }
    for (org.hullbound.lang.Statement s : model.statements()) {
      if (s instanceof org.hullbound.lang.Statement.Data data && data.censoring() != null) {
        // Replicates would need the censoring (which rows, which limits) simulated too, and the
        // model does not say how the limits came about.
        throw new SimulationException(
            "cannot simulate model " + bound.name() + ": '" + data.targets().get(0).name().text()
                + "' is censored (line " + data.censoring().position().line() + "), and the model"
                + " does not say how its limits arise; calibrate the model without the censored"
                + " clause");
      }
    }
    return new Calibration(model, List.copyOf(tables), bound, fitter);
  }

  /** The model's name. */
  public String modelName() {
    return bound.name();
  }

  /**
   * What is ranked: the model's unknowns in state order, then its kept derived quantities (a
   * function of the unknowns ranks uniformly too when the sampler is exact).
   */
  public List<String> labels() {
    List<String> labels = new ArrayList<>();
    bound.unknowns().forEach(u -> labels.add(u.label()));
    labels.addAll(bound.derived().labels());
    return labels;
  }

  /**
   * Runs every replicate, one after another.
   *
   * @param progress called after each replicate with the number done (may be a no-op)
   * @throws SimulationException when a prior or likelihood cannot be drawn
   */
  public CalibrationResult run(CalibrationSettings settings, java.util.function.IntConsumer progress) {
    SplittableGenerator root = root(settings);
    int[][] ranks = new int[settings.replicates()][];
    for (int n = 0; n < settings.replicates(); n++) {
      ranks[n] = replicate(settings, root.split());
      progress.accept(n + 1);
    }
    return result(settings, ranks);
  }

  /**
   * The ranks of replicate {@code n} (from 0) alone, the same as {@link #run} finds for it: its
   * generator is the root's {@code (n + 1)}-th split, whichever machine or order runs it, so that
   * replicates can run as independent tasks ({@link CalibrationTask}).
   */
  public int[] replicate(CalibrationSettings settings, int n) {
    if (n < 0 || n >= settings.replicates()) {
      throw new IllegalArgumentException(
          "n must be in 0 .. " + (settings.replicates() - 1) + ", got " + n);
    }
    SplittableGenerator root = root(settings);
    for (int skipped = 0; skipped < n; skipped++) {
      root.split();
    }
    return replicate(settings, root.split());
  }

  private static SplittableGenerator root(CalibrationSettings settings) {
    return (SplittableGenerator) RandomGeneratorFactory.of(ALGORITHM).create(settings.seed());
  }

  /** Steps (1) to (4) of one replicate with its own generator {@code rng}. */
  private int[] replicate(CalibrationSettings settings, RandomGenerator rng) {
    PriorSimulation simulation = PriorSimulation.of(bound);
    List<String> labels = labels();
    // (1) prior draw, (2) simulated data.
    double[] unknowns = simulation.drawUnknowns(rng);
    SimulatedData.Inputs inputs =
        SimulatedData.replace(model, tables, simulation.simulateObservations(unknowns, rng));
    // The kept derived quantities' prior values, computed as fit computes them from a state.
    double[] truth = Arrays.copyOf(unknowns, labels.size());
    bound.derived().evaluate(unknowns, truth, unknowns.length);
    BoundModel replicate = BoundModel.bind(inputs.model(), inputs.tables());
    // (3) the fit, with its own seed from this replicate's stream.
    double[][] posterior =
        fitter.fit(replicate, settings.draws(), settings.thin(), settings.burnIn(), rng.nextLong());
    // (4) ranks.
    int[] ranks = new int[labels.size()];
    for (int i = 0; i < labels.size(); i++) {
      ranks[i] = rank(truth[i], posterior[i], rng);
    }
    return ranks;
  }

  /**
   * The uniformity tests of every unknown over {@code ranks} ({@code [replicate][unknown]}, as
   * {@link #replicate} gives them, in replicate order).
   */
  public CalibrationResult result(CalibrationSettings settings, int[][] ranks) {
    if (ranks.length != settings.replicates()) {
      throw new IllegalArgumentException(
          "ranks must hold " + settings.replicates() + " replicates, got " + ranks.length);
    }
    int bins = settings.binCount();
    List<String> labels = labels();
    List<RankUniformity> tests = new ArrayList<>();
    for (int i = 0; i < labels.size(); i++) {
      int[] column = new int[ranks.length];
      for (int n = 0; n < ranks.length; n++) {
        column[n] = ranks[n][i];
      }
      tests.add(RankUniformity.of(labels.get(i), column, settings.draws(), bins));
    }
    return new CalibrationResult(bound.name(), labels, ranks, tests, settings);
  }

  /** How many draws lie below {@code truth}, ties counted below with probability 1/2 each. */
  static int rank(double truth, double[] draws, RandomGenerator rng) {
    int below = 0;
    int equal = 0;
    for (double d : draws) {
      if (d < truth) {
        below++;
      } else if (d == truth) {
        equal++;
      }
    }
    // A uniform position among the ties keeps the rank uniform for discrete unknowns.
    return below + (equal == 0 ? 0 : rng.nextInt(equal + 1));
  }
}
