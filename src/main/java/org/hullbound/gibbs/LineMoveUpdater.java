package org.hullbound.gibbs;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.random.RandomGenerator;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * One chain's extra move along a line ({@link UpdateRule.Move}): draws the position {@code t}
 * from the line's density, by adaptive rejection where it is log-concave and by the fallback
 * otherwise, and moves the state there.
 *
 * <p>A fixed line (a shift or a rescaling) is one draw per sweep. A learned line is a block of
 * unknowns drawn along directions fixed after burn-in: during burn-in the block's values are
 * collected after each sweep in windows ending at a quarter, a half and all of it; at each
 * window's end the directions become the eigenvectors of that window's covariance (ejml's
 * symmetric eigen-decomposition), scaled by the square root of their eigenvalues, so that each
 * position has a spread near 1. Each sweep then draws once along every direction: a hit-and-run
 * kernel over a fixed set of directions (Belisle, Romeijn and Smith 1993), each draw an exact
 * Gibbs step on its line. As nothing changes after burn-in, the kept draws come from one fixed
 * kernel that leaves the posterior invariant. No burn-in: no directions, and the move does
 * nothing.
 *
 * <p>The draw itself is the one-unknown updater's, on a frame whose entry {@link
 * LineTarget#position()} holds the position, starting at the identity (0, or 1 for a rescaling):
 * so a line gets the same warm start, run-time switch to the fallback and evaluation counts as an
 * unknown does.
 */
final class LineMoveUpdater implements Updater {
  /** A window gives directions only from at least this many sweeps (and twice the block's size). */
  static final int FEWEST_SWEEPS = 20;

  private final UpdateRule.Move rule;
  private final LineTarget line;
  private final int size;
  private final long adaptationSweeps;
  private final double[] frame;
  private final long[] windowEnds;
  private double[][] directions;
  private Updater[] draws;
  private long createdAt;
  private long sweeps;
  private long moves;
  private long retiredEvaluations;
  private long seen;
  private double[] mean;
  private double[][] comoment;

  LineMoveUpdater(UpdateRule.Move rule, long adaptationSweeps) {
    this.rule = rule;
    this.line = rule.line();
    this.size = line.members().length;
    this.adaptationSweeps = adaptationSweeps;
    this.frame = new double[line.frameLength()];
    this.windowEnds = adaptationSweeps >= 4L * FEWEST_SWEEPS
        ? new long[] {adaptationSweeps / 4, adaptationSweeps / 2, adaptationSweeps}
        : new long[] {adaptationSweeps};
    this.mean = new double[size];
    this.comoment = new double[size][size];
    if (!line.learned()) {
      directions = new double[1][];
      draws = new Updater[] {lineDraw(0)};
    }
  }

  @Override
  public void update(double[] state, RandomGenerator rng) {
    sweeps++;
    if (directions != null) {
      for (int k = 0; k < directions.length; k++) {
        line.load(state, frame);
        if (line.learned()) {
          line.direct(directions[k], frame);
        }
        frame[line.position()] = line.identity();
        draws[k].update(frame, rng);
        line.apply(frame[line.position()], state, frame);
        moves++;
      }
    }
    if (line.learned() && sweeps <= adaptationSweeps) {
      collect(state);
      if (Arrays.binarySearch(windowEnds, sweeps) >= 0) {
        learnDirections();
      }
    }
  }

  /** Welford's running mean and co-moments of the block's values (Welford 1962). */
  private void collect(double[] state) {
    int[] members = line.members();
    seen++;
    double[] delta = new double[size];
    for (int i = 0; i < size; i++) {
      delta[i] = state[members[i]] - mean[i];
      mean[i] += delta[i] / seen;
    }
    for (int i = 0; i < size; i++) {
      for (int j = 0; j < size; j++) {
        comoment[i][j] += delta[i] * (state[members[j]] - mean[j]);
      }
    }
  }

  /** This window's eigenvectors, scaled; the window starts over. */
  private void learnDirections() {
    double[][] learned = seen >= Math.max(FEWEST_SWEEPS, 2L * size) ? eigenDirections() : null;
    seen = 0;
    mean = new double[size];
    comoment = new double[size][size];
    if (learned == null) {
      return;
    }
    if (draws != null) {
      for (Updater retired : draws) {
        retiredEvaluations += retired.evaluations();
      }
    }
    directions = learned;
    createdAt = sweeps;
    draws = new Updater[learned.length];
    for (int k = 0; k < learned.length; k++) {
      draws[k] = lineDraw(createdAt);
    }
  }

  private double[][] eigenDirections() {
    DMatrixRMaj covariance = new DMatrixRMaj(size, size);
    for (int i = 0; i < size; i++) {
      for (int j = 0; j < size; j++) {
        covariance.set(i, j, comoment[i][j] / (seen - 1));
      }
    }
    EigenDecomposition_F64<DMatrixRMaj> eigen = DecompositionFactory_DDRM.eig(size, true, true);
    if (!eigen.decompose(covariance)) {
      return null;
    }
    List<double[]> found = new ArrayList<>();
    for (int k = 0; k < eigen.getNumberOfEigenvalues(); k++) {
      double value = eigen.getEigenvalue(k).real;
      DMatrixRMaj vector = eigen.getEigenVector(k);
      if (!(value > 0) || !Double.isFinite(value) || vector == null) {
        continue;
      }
      double[] direction = new double[size];
      double scale = Math.sqrt(value);
      for (int i = 0; i < size; i++) {
        direction[i] = vector.get(i, 0) * scale;
      }
      found.add(direction);
    }
    return found.isEmpty() ? null : found.toArray(new double[0][]);
  }

  /** The one-unknown updater of the position, adapting for what is left of burn-in. */
  private Updater lineDraw(long atSweep) {
    ScalarConditional position = new ScalarConditional() {
      @Override
      public double logDensity(double t, double[] frame, double[] slope) {
        return line.logDensity(t, frame, slope);
      }

      @Override
      public double lowerBound(double[] frame) {
        return line.lower();
      }

      @Override
      public boolean smooth() {
        return line.smooth();
      }
    };
    long left = Math.max(0, adaptationSweeps - atSweep);
    return rule.logConcave()
        ? new AdaptiveRejectionUpdater(
            new UpdateRule.AdaptiveRejection(line.position(), position, rule.reason()), left)
        : new FallbackUpdater(
            new UpdateRule.Fallback(line.position(), position, rule.reason()), left,
            line.identity(), 1.0);
  }

  /** The rule's members: what a move changes and that it is extra are the rule's to say. */
  @Override
  public int[] indices() {
    return rule.indices();
  }

  @Override
  public boolean extra() {
    return rule.extra();
  }

  @Override
  public String method() {
    String how = rule.logConcave() ? "" : ", fallback";
    if (draws != null) {
      for (Updater draw : draws) {
        if (draw.switchNote() != null) {
          how = ", then fallback";
        }
      }
    }
    return rule.name() + how;
  }

  /** Line draws made so far (one per direction per sweep). */
  @Override
  public long draws() {
    return moves;
  }

  @Override
  public long evaluations() {
    long total = retiredEvaluations;
    if (draws != null) {
      for (Updater draw : draws) {
        total += draw.evaluations();
      }
    }
    return total;
  }

  @Override
  public UpdaterState save() {
    UpdaterState.Writer out = new UpdaterState.Writer();
    out.put(adaptationSweeps).put(sweeps).put(moves).put(retiredEvaluations).put(createdAt)
        .put(seen);
    for (int i = 0; i < size; i++) {
      out.put(mean[i]);
      for (int j = 0; j < size; j++) {
        out.put(comoment[i][j]);
      }
    }
    out.put(directions == null ? 0L : (long) directions.length);
    StringBuilder notes = new StringBuilder();
    if (directions != null) {
      for (int k = 0; k < directions.length; k++) {
        if (line.learned()) {
          for (double w : directions[k]) {
            out.put(w);
          }
        }
        UpdaterState inner = draws[k].save();
        long[] words = inner.words();
        out.put((long) words.length);
        for (long word : words) {
          out.put(word);
        }
        notes.append(k == 0 ? "" : NOTE_SEPARATOR).append(inner.note() == null ? "" : inner.note());
      }
    }
    return out.note(notes.toString()).done();
  }

  /** Separates the inner draws' notes in the one note a saved state holds. */
  private static final String NOTE_SEPARATOR = "\u001f";

  @Override
  public void restore(UpdaterState saved) {
    UpdaterState.Reader in = new UpdaterState.Reader(saved, method());
    long savedAdaptation = in.nextLong();
    if (savedAdaptation != adaptationSweeps) {
      throw new IllegalArgumentException("the saved state of " + method() + " adapts for "
          + savedAdaptation + " sweeps, this run for " + adaptationSweeps);
    }
    long restoredSweeps = in.nextLong();
    long restoredMoves = in.nextLong();
    long restoredRetired = in.nextLong();
    long restoredCreatedAt = in.nextLong();
    long restoredSeen = in.nextLong();
    double[] restoredMean = new double[size];
    double[][] restoredComoment = new double[size][size];
    for (int i = 0; i < size; i++) {
      restoredMean[i] = in.nextDouble();
      for (int j = 0; j < size; j++) {
        restoredComoment[i][j] = in.nextDouble();
      }
    }
    int count = (int) in.nextLong();
    String[] notes = saved.note() == null ? new String[0] : saved.note().split(NOTE_SEPARATOR, -1);
    double[][] restoredDirections = count == 0 ? null : new double[count][];
    Updater[] restoredDraws = count == 0 ? null : new Updater[count];
    for (int k = 0; k < count; k++) {
      if (line.learned()) {
        restoredDirections[k] = new double[size];
        for (int i = 0; i < size; i++) {
          restoredDirections[k][i] = in.nextDouble();
        }
      }
      long[] words = new long[(int) in.nextLong()];
      for (int w = 0; w < words.length; w++) {
        words[w] = in.nextLong();
      }
      restoredDraws[k] = lineDraw(restoredCreatedAt);
      String note = k < notes.length && !notes[k].isEmpty() ? notes[k] : null;
      restoredDraws[k].restore(new UpdaterState(words, note));
    }
    in.end();
    sweeps = restoredSweeps;
    moves = restoredMoves;
    retiredEvaluations = restoredRetired;
    createdAt = restoredCreatedAt;
    seen = restoredSeen;
    mean = restoredMean;
    comoment = restoredComoment;
    directions = restoredDirections;
    draws = restoredDraws;
  }
}
