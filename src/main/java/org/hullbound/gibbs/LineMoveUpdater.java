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
 * position has a spread near 1. At the end of burn-in the directions become instead, where it can
 * be measured, fitted to the block's <em>conditional</em> covariance given the rest of the state,
 * the inverse of the block's Hessian H (central differences of the line's slopes along the
 * members and their pairs, averaged over the last {@value #HESSIAN_SWEEPS} sweeps of burn-in):
 * the eigenvectors of that covariance in units of the members' burn-in sds, scaled back, which are
 * conjugate under H with unit length ({@code d_k^T H d_l} is 1 or 0, so {@code D D^T = H^-1}).
 * Drawing along those is (for a normal conditional, exactly) a joint draw of the block given the
 * rest, which the members' one-at-a-time draws then no longer improve: {@link #replacesMembers()}
 * says the sweep may leave them out (a fixed kernel after burn-in all the same; the directions
 * span the block). The burn-in covariance mixes in how the block moves with the rest (the
 * clinics intercept with the mean of the effects) and gave the clinics slope 0.52 effective draws
 * per sweep without the one-at-a-time draws against 0.94 with the Hessian's directions (one chain
 * of 8,000 sweeps, busy machine). Each sweep then draws once along every direction: a hit-and-run
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

  /** The Hessian that sets the last directions is averaged over this many last burn-in sweeps. */
  static final int HESSIAN_SWEEPS = 10;

  /** Central differences of the slopes step this many burn-in sds of each member. */
  private static final double HESSIAN_STEP = 1e-3;

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
  /** The sum of the Hessians measured in the last burn-in sweeps, in units of the sds. */
  private double[][] hessianSum;
  private double[] hessianScale;
  private int hessians;
  /** Set at the end of burn-in when the directions came from the Hessian and span the block. */
  private boolean replacesMembers;

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
      if (sweeps > adaptationSweeps - HESSIAN_SWEEPS) {
        measureHessian(state);
      }
      if (Arrays.binarySearch(windowEnds, sweeps) >= 0) {
        learnDirections();
      }
      if (sweeps == adaptationSweeps) {
        adoptConditionalDirections();
      }
    }
  }

  /**
   * True after burn-in when the directions are fitted to the block's conditional covariance and
   * span it: the sweep may then leave out the members' own draws.
   */
  boolean replacesMembers() {
    return replacesMembers;
  }

  /** A copy of the directions drawn along now, or null before there are any. */
  double[][] directions() {
    if (directions == null) {
      return null;
    }
    double[][] copy = new double[directions.length][];
    for (int k = 0; k < directions.length; k++) {
      copy[k] = directions[k] == null ? null : directions[k].clone();
    }
    return copy;
  }

  /**
   * The sweeps in which this block's draws replaced its members' own: in each, every member was
   * drawn anew (jointly), so the summary counts them as draws of the members.
   */
  long memberDraws() {
    return replacesMembers ? sweeps - createdAt : 0;
  }

  /** True for a direction block (a line learned during burn-in). */
  boolean learnsDirections() {
    return line.learned();
  }

  /**
   * Adds the block's Hessian at {@code state} to the running sum: -d/dt of the line's slope along
   * {@code v = sd_i e_i} and {@code sd_i e_i + sd_j e_j}, by central differences at {@code t = +-}
   * {@value #HESSIAN_STEP} (the Hessian's quadratic form {@code v^T H v}); the step's scale is the
   * sd of each member in the burn-in window so far. Burn-in only: what this measures changes
   * nothing but the directions fixed at its end.
   */
  private void measureHessian(double[] state) {
    if (hessianScale == null) {
      if (seen < 2) {
        return;
      }
      hessianScale = new double[size];
      for (int i = 0; i < size; i++) {
        hessianScale[i] = Math.sqrt(comoment[i][i] / (seen - 1));
        if (!(hessianScale[i] > 0) || !Double.isFinite(hessianScale[i])) {
          hessianScale = null;
          return;
        }
      }
      hessianSum = new double[size][size];
    }
    double[][] h = new double[size][size];
    double[] v = new double[size];
    for (int i = 0; i < size; i++) {
      for (int j = 0; j <= i; j++) {
        Arrays.fill(v, 0);
        v[i] = hessianScale[i];
        if (j != i) {
          v[j] = hessianScale[j];
        }
        h[i][j] = curvatureAlong(v, state);
        if (!Double.isFinite(h[i][j])) {
          return;
        }
      }
    }
    for (int i = 0; i < size; i++) {
      for (int j = 0; j < i; j++) {
        double mixed = (h[i][j] - h[i][i] - h[j][j]) / 2;
        hessianSum[i][j] += mixed;
        hessianSum[j][i] += mixed;
      }
      hessianSum[i][i] += h[i][i];
    }
    hessians++;
  }

  /** {@code v^T H v} of the block's log-density at {@code state}, from two slopes along v. */
  private double curvatureAlong(double[] v, double[] state) {
    line.load(state, frame);
    line.direct(v, frame);
    double[] slope = new double[1];
    line.logDensity(HESSIAN_STEP, frame, slope);
    double above = slope[0];
    line.logDensity(-HESSIAN_STEP, frame, slope);
    retiredEvaluations += 2;
    return -(above - slope[0]) / (2 * HESSIAN_STEP);
  }

  /**
   * At the end of burn-in: the eigenvectors of the inverse of the averaged Hessian (the
   * conditional covariance, in units of the sds), scaled by the square roots of their eigenvalues
   * and back to the members' units, replace the last window's directions where the Hessian is
   * positive definite; then the block's draws replace its members' own. With G = S H S (S the
   * sds) = V L V^T, the directions D = S V L^(-1/2) give D^T H D = I.
   */
  private void adoptConditionalDirections() {
    if (hessians == 0) {
      return;
    }
    DMatrixRMaj hessian = new DMatrixRMaj(size, size);
    for (int i = 0; i < size; i++) {
      for (int j = 0; j < size; j++) {
        hessian.set(i, j, hessianSum[i][j] / hessians);
      }
    }
    double[][] found = eigenDirections(hessian, true);
    if (found == null || found.length != size) {
      return;
    }
    for (double[] direction : found) {
      for (int i = 0; i < size; i++) {
        direction[i] *= hessianScale[i];
      }
    }
    adopt(found);
    replacesMembers = true;
  }

  /** Draws along {@code found} from now on, each line with a new draw; the old ones retire. */
  private void adopt(double[][] found) {
    if (draws != null) {
      for (Updater retired : draws) {
        retiredEvaluations += retired.evaluations();
      }
    }
    directions = found;
    createdAt = sweeps;
    draws = new Updater[found.length];
    for (int k = 0; k < found.length; k++) {
      draws[k] = lineDraw(createdAt);
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
    if (learned != null) {
      adopt(learned);
    }
  }

  private double[][] eigenDirections() {
    DMatrixRMaj covariance = new DMatrixRMaj(size, size);
    for (int i = 0; i < size; i++) {
      for (int j = 0; j < size; j++) {
        covariance.set(i, j, comoment[i][j] / (seen - 1));
      }
    }
    return eigenDirections(covariance, false);
  }

  /**
   * The eigenvectors of a symmetric matrix scaled by the square roots of their eigenvalues (of
   * its inverse's, the reciprocals, when {@code inverse}: the same eigenvectors), those with a
   * positive finite eigenvalue only; null when there is none.
   */
  private double[][] eigenDirections(DMatrixRMaj matrix, boolean inverse) {
    EigenDecomposition_F64<DMatrixRMaj> eigen = DecompositionFactory_DDRM.eig(size, true, true);
    if (!eigen.decompose(matrix)) {
      return null;
    }
    List<double[]> found = new ArrayList<>();
    for (int k = 0; k < eigen.getNumberOfEigenvalues(); k++) {
      double value = eigen.getEigenvalue(k).real;
      value = inverse ? 1 / value : value;
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
    return rule.name() + (switchedDraw() != null ? ", then fallback" : how);
  }

  /**
   * The first line draw's switch to the fallback, named as the move's (the moved unknowns' report
   * says it, so that a move's switch is never silent), else null.
   */
  @Override
  public String switchNote() {
    Updater switched = switchedDraw();
    return switched == null ? null : rule.name() + ": " + switched.switchNote();
  }

  @Override
  public long switchSweep() {
    Updater switched = switchedDraw();
    return switched == null ? 0 : switched.switchSweep();
  }

  private Updater switchedDraw() {
    if (draws != null) {
      for (Updater draw : draws) {
        if (draw != null && draw.switchNote() != null) {
          return draw;
        }
      }
    }
    return null;
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
    out.put(replacesMembers ? 1L : 0L).put((long) hessians).put(hessianScale == null ? 0L : 1L);
    if (hessianScale != null) {
      for (int i = 0; i < size; i++) {
        out.put(hessianScale[i]);
        for (int j = 0; j < size; j++) {
          out.put(hessianSum[i][j]);
        }
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
    boolean restoredReplaces = in.nextFlag();
    int restoredHessians = (int) in.nextLong();
    double[] restoredScale = null;
    double[][] restoredHessianSum = null;
    if (in.nextFlag()) {
      restoredScale = new double[size];
      restoredHessianSum = new double[size][size];
      for (int i = 0; i < size; i++) {
        restoredScale[i] = in.nextDouble();
        for (int j = 0; j < size; j++) {
          restoredHessianSum[i][j] = in.nextDouble();
        }
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
    replacesMembers = restoredReplaces;
    hessians = restoredHessians;
    hessianScale = restoredScale;
    hessianSum = restoredHessianSum;
  }
}
