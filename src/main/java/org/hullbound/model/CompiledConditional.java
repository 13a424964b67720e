package org.hullbound.model;

import java.util.List;
import org.hullbound.model.family.AffineRows;
import org.hullbound.model.family.ArgumentRange;
import org.hullbound.model.family.Parametrisation;
import org.hullbound.model.family.Scale;

/**
 * A full conditional compiled from its Markov blanket: one {@link Evaluator} tree per argument of
 * each term, the family's own log-density (with its normalising constants) per term, the
 * truncation normaliser where the arguments move, and the change of variable to the sampling
 * scale with its log-Jacobian.
 *
 * <p>Change of variable (any textbook on densities of transformed variables): for {@code x =
 * g(u)} the density of {@code u} is {@code p(g(u)) |g'(u)|}. On the log scale {@code g(u) =
 * exp(u)}, {@code log g' = u}; on the logit scale {@code g(u) = expit(u)}, {@code log g' =
 * log x + log(1 - x)} with derivative {@code 1 - 2x}.
 *
 * <p>The support is the own term's, cut by {@link ArgumentBounds} to where the dependent terms'
 * arguments stay in range; a moving argument outside its range (at a point no bound foresaw)
 * makes the value {@code -inf}, as the density is zero there.
 *
 * <p>Cheap evaluations (common practice in Gibbs samplers for generalised linear models): within
 * one draw only the unknown moves, so each part of a term (its value and each argument) that is
 * affine in it, {@code a + b x}, has {@code a} and {@code b} worked out once per draw from the
 * other unknowns, and a part that does not read it is a number for the whole draw; an evaluation
 * then costs one multiply-add per moving part and the family's log-density. A draw is recognised
 * by its inputs, not by a call from the driver: each thread keeps a {@link Workspace} with the
 * values of the other unknowns the terms read when the parts were worked out, and any change
 * (compared bit for bit) works them out again, so a stale part can never be used. Parts that are
 * not affine in the unknown are evaluated as compiled trees at every call. Nothing is allocated
 * per evaluation: the workspace's frame is reused.
 *
 * <p>Runs of consecutive terms of one parametrisation whose only moving part is one affine
 * argument (the observations of a generalised linear model) are summed by that family's {@link
 * AffineRows} loop over the workspace's arrays rather than a term at a time through the family's
 * interface: the same additions in the same order, so the same bits, without a call a term.
 *
 * <p>Blankets that follow an allocation ({@link UnknownIndex}): a term that reads an unknown index
 * ({@code y[i] ~ normal(mean = mu[g[i]], ...)}, lowered to {@code sum of mu[k] [g[i] = k]}) is a
 * <em>candidate</em> of every {@code mu[k]} it may select. When every place the term reads the
 * unknown lies inside an option {@code [g[i] = k] * (...)} (its <em>guards</em>, {@link
 * UnknownIndex#guards}), the guards worked out for the draw say whether it is in the blanket: all
 * 0 means the allocation points elsewhere, the term is a constant for the whole draw, and the draw
 * leaves it out. Each draw thus evaluates the own term and the observations currently assigned to
 * the unknown, found once per draw from the candidates (their indicators read inputs, so a
 * changed allocation is a new draw); the model is never rebuilt. The value then omits those
 * constants, as a conditional log-density may (the samplers compare values within one draw only).
 */
final class CompiledConditional implements ConditionalDensity {
  private final Unknown unknown;
  private final Scale scale;
  private final TermEvaluator[] terms;
  private final boolean[] aritiesUsed;
  private final Evaluator lower;
  private final Evaluator upper;
  private final ArgumentBounds cuts;
  /**
   * The bounds on the sampling scale where they are constants, NaN where they move with the
   * state: adaptive rejection asks for them before every draw.
   */
  private final double constantLower;
  private final double constantUpper;
  private final boolean smooth;
  /** The other unknowns' slots that the terms read, each once: a draw's inputs. */
  private final int[] inputs;
  /** Where each term's parts start in a workspace's part arrays. */
  private final int[] firstPart;
  private final int partCount;
  /**
   * The parts whose {@code a} and {@code b} are linear in the other unknowns with known
   * coefficients (a predictor over data covariates), kept flat: form {@code 2 part} is {@code
   * a}, {@code 2 part + 1} is {@code b}, entries {@code formStart[f] .. formStart[f + 1]}.
   */
  private final boolean[] linearPart;
  private final int[] formStart;
  private final double[] formConstant;
  private final int[] formSlot;
  private final double[] formCoefficient;
  /**
   * The parts whose linear forms read another unknown, worked out at every draw; the others'
   * forms are constants (an observed value, a known argument), worked out once per workspace.
   */
  private final int[] varyingLinearParts;
  /** The terms with an affine part whose {@code a} or {@code b} is a tree, not a linear form. */
  private final int[] treePrepared;
  /**
   * Per term: the indicators that guard every place it reads the unknown ({@link
   * UnknownIndex#guards}), or {@code null} for a term always in the blanket; a draw in which all
   * are 0 leaves the term out (the allocation selects another element).
   */
  private final Evaluator[][] guards;
  private final boolean anyGated;
  /** The member lists of a blanket that follows an allocation, or {@code null}. */
  private final AllocationMembers members;
  /**
   * The terms in blanket order as runs: a run of consecutive terms that one {@link AffineRows}
   * loop sums ({@code runRows[r]} not null, {@code runLength[r]} terms from {@code runStart[r]}),
   * or a single term evaluated alone. Null when a blanket follows an allocation (the active list
   * decides then).
   */
  private final int[] runStart;
  private final int[] runLength;
  private final AffineRows[] runRows;
  /**
   * Per run: where its rows' kept numbers ({@link AffineRows#keep}) start in a workspace, and
   * whether they must be worked out again at each draw (some part that does not move reads
   * another unknown) rather than once.
   */
  private final int[] runKeptFirst;
  private final boolean[] runKeptPerDraw;
  private final int keptCount;
  private final ThreadLocal<Workspace> workspaces = ThreadLocal.withInitial(Workspace::new);

  CompiledConditional(
      Unknown unknown, List<Term> blanket, Formula lower, Formula upper, ArgumentBounds cuts,
      boolean smooth) {
    this.unknown = unknown;
    this.scale = unknown.scale();
    int slot = unknown.index();
    this.terms = new TermEvaluator[blanket.size()];
    int maxArity = 0;
    for (Term t : blanket) {
      maxArity = Math.max(maxArity, t.arguments().size());
    }
    this.aritiesUsed = new boolean[maxArity + 1];
    this.guards = new Evaluator[terms.length][];
    List<List<Formula>> guardFormulas = new java.util.ArrayList<>();
    List<Term> evaluated = new java.util.ArrayList<>();
    for (int i = 0; i < terms.length; i++) {
      List<Formula> found = UnknownIndex.guards(blanket.get(i), slot);
      guardFormulas.add(found);
      if (found != null) {
        guards[i] = found.stream().map(f -> Evaluator.compile(f, -1)).toArray(Evaluator[]::new);
      }
      // A gated term is evaluated only while selected, so in the form it takes then.
      evaluated.add(AllocationMembers.memberForm(blanket.get(i), found));
      terms[i] = new TermEvaluator(evaluated.get(i), slot, scale);
      aritiesUsed[blanket.get(i).arguments().size()] = true;
    }
    this.lower = Evaluator.compile(lower, -1);
    this.upper = Evaluator.compile(upper, -1);
    this.cuts = cuts;
    double[] none = new double[0];
    this.constantLower = lower instanceof Formula.Constant c && cuts.fixed()
        ? toSamplingScale(Math.max(c.value(), cuts.lower(none))) : Double.NaN;
    this.constantUpper = upper instanceof Formula.Constant c && cuts.fixed()
        ? toSamplingScale(Math.min(c.value(), cuts.upper(none))) : Double.NaN;
    this.smooth = smooth;
    java.util.Set<Integer> read = new java.util.TreeSet<>();
    for (Term t : blanket) {
      t.value().collectSlots(read);
      for (Formula a : t.arguments()) {
        a.collectSlots(read);
      }
    }
    read.remove(slot);
    this.inputs = read.stream().mapToInt(Integer::intValue).toArray();
    this.firstPart = new int[terms.length];
    int parts = 0;
    for (int i = 0; i < terms.length; i++) {
      firstPart[i] = parts;
      parts += 1 + terms[i].arity;
    }
    this.partCount = parts;
    this.linearPart = new boolean[parts];
    this.formStart = new int[2 * parts + 1];
    this.formConstant = new double[2 * parts];
    int entries = 0;
    for (int i = 0; i < terms.length; i++) {
      for (int p = 0; p <= terms[i].arity; p++) {
        for (int side = 0; side < 2; side++) {
          Formulas.LinearForm form = terms[i].linearForms[2 * p + side];
          entries += form == null ? 0 : form.slots().length;
        }
      }
    }
    this.formSlot = new int[entries];
    this.formCoefficient = new double[entries];
    int next = 0;
    for (int i = 0; i < terms.length; i++) {
      for (int p = 0; p <= terms[i].arity; p++) {
        int part = firstPart[i] + p;
        linearPart[part] = terms[i].linearForms[2 * p] != null;
        for (int side = 0; side < 2; side++) {
          int f = 2 * part + side;
          formStart[f] = next;
          Formulas.LinearForm form = terms[i].linearForms[2 * p + side];
          if (form != null) {
            formConstant[f] = form.constant();
            System.arraycopy(form.slots(), 0, formSlot, next, form.slots().length);
            System.arraycopy(form.coefficients(), 0, formCoefficient, next, form.slots().length);
            next += form.slots().length;
          }
        }
      }
      terms[i].linearForms = null;
    }
    formStart[2 * parts] = next;
    this.varyingLinearParts = java.util.stream.IntStream.range(0, parts)
        .filter(part -> linearPart[part] && formStart[2 * part + 2] > formStart[2 * part])
        .toArray();
    this.treePrepared = java.util.stream.IntStream.range(0, terms.length)
        .filter(i -> terms[i].preparesTrees()).toArray();
    this.members = AllocationMembers.of(evaluated, slot, inputs, guardFormulas, guards);
    this.anyGated = members != null;
    if (anyGated) {
      this.runStart = null;
      this.runLength = null;
      this.runRows = null;
      this.runKeptFirst = null;
      this.runKeptPerDraw = null;
      this.keptCount = 0;
    } else {
      List<int[]> runs = new java.util.ArrayList<>();
      for (int i = 0; i < terms.length; i++) {
        int[] last = runs.isEmpty() ? null : runs.get(runs.size() - 1);
        if (last != null && terms[i].rows != null && terms[last[0]].joins(terms[i])) {
          last[1]++;
        } else {
          runs.add(new int[] {i, 1});
        }
      }
      this.runStart = runs.stream().mapToInt(r -> r[0]).toArray();
      this.runLength = runs.stream().mapToInt(r -> r[1]).toArray();
      this.runRows = runs.stream().map(r -> terms[r[0]].rows).toArray(AffineRows[]::new);
      this.runKeptFirst = new int[runRows.length];
      this.runKeptPerDraw = new boolean[runRows.length];
      int kept = 0;
      for (int r = 0; r < runRows.length; r++) {
        runKeptFirst[r] = kept;
        if (runRows[r] == null || runRows[r].keptPerRow() == 0) {
          continue;
        }
        kept += runRows[r].keptPerRow() * runLength[r];
        for (int i = runStart[r]; i < runStart[r] + runLength[r]; i++) {
          for (int p = 0; p <= terms[i].arity; p++) {
            int part = firstPart[i] + p;
            boolean constant = linearPart[part] && formStart[2 * part + 2] == formStart[2 * part];
            runKeptPerDraw[r] |= p != 1 + terms[i].moving[0] && !constant;
          }
        }
      }
      this.keptCount = kept;
    }
  }

  /** Whether some term's blanket membership follows an allocation ({@link UnknownIndex}). */
  boolean dynamicBlanket() {
    return anyGated;
  }

  /**
   * The number of terms a draw at {@code state} evaluates: all of them, but for the candidates
   * whose allocation selects another element (see the class comment).
   */
  int activeTermCount(double[] state) {
    Workspace workspace = workspaces.get();
    workspace.prepare(state);
    return workspace.activeCount;
  }

  /** {@code constant + sum of coefficient * state[slot]} of form {@code f}. */
  private double linearValue(int f, double[] state) {
    double value = formConstant[f];
    for (int e = formStart[f]; e < formStart[f + 1]; e++) {
      value += formCoefficient[e] * state[formSlot[e]];
    }
    return value;
  }

  /**
   * One thread's scratch space: a reused frame, the inputs the parts were worked out at, and each
   * part's {@code a} and {@code b} ({@code part = a + b x}) for the current draw.
   */
  private final class Workspace implements AllocationMembers.Preparation {
    final Frame frame = new Frame(Double.NaN, null, aritiesUsed);
    final double[] inputValues = new double[inputs.length];
    final double[] intercepts = new double[partCount];
    final double[] slopes = new double[partCount];
    /** The terms this draw evaluates, {@code active[0 .. activeCount)}, in blanket order. */
    final int[] active = java.util.stream.IntStream.range(0, terms.length).toArray();
    int activeCount = terms.length;
    /** The running value and slope handed to an {@link AffineRows} loop and back. */
    final double[] sums = new double[2];
    /** The runs' kept numbers ({@link AffineRows#keep}). */
    final double[] kept = new double[keptCount];
    boolean ready;
    /** The members of a blanket that follows an allocation, kept up to date, or null. */
    final AllocationMembers.Tracker tracker = members == null ? null : members.tracker();

    Workspace() {
      for (int part = 0; part < partCount; part++) {
        if (linearPart[part]) {
          intercepts[part] = formConstant[2 * part];
          slopes[part] = formConstant[2 * part + 1];
        }
      }
      keep(false);
    }

    /** Works out the kept numbers of the runs that keep them once, or of those kept per draw. */
    void keep(boolean perDraw) {
      for (int r = 0; runRows != null && r < runRows.length; r++) {
        if (runRows[r] != null && runRows[r].keptPerRow() > 0 && runKeptPerDraw[r] == perDraw) {
          runRows[r].keep(intercepts, firstPart[runStart[r]], runLength[r], kept,
              runKeptFirst[r]);
        }
      }
    }

    /** Works the parts out again unless every input holds the bits it held last time. */
    void prepare(double[] state) {
      if (tracker != null) {
        if (tracker.sync(frame.at(Double.NaN, state), this)) {
          activeCount = tracker.list(active);
        }
        return;
      }
      if (ready && sameInputs(state)) {
        return;
      }
      frame.at(Double.NaN, state);
      for (int i : treePrepared) {
        terms[i].prepare(frame, intercepts, slopes, firstPart[i]);
      }
      for (int part : varyingLinearParts) {
        intercepts[part] = linearValue(2 * part, state);
        slopes[part] = linearValue(2 * part + 1, state);
      }
      keep(true);
      for (int j = 0; j < inputs.length; j++) {
        inputValues[j] = state[inputs[j]];
      }
      ready = true;
    }

    /** Term {@code i}'s prepared parts at the frame's state ({@link AllocationMembers}). */
    @Override
    public void prepare(int i) {
      terms[i].prepare(frame, intercepts, slopes, firstPart[i]);
      for (int part = firstPart[i]; part <= firstPart[i] + terms[i].arity; part++) {
        if (linearPart[part]) {
          intercepts[part] = linearValue(2 * part, frame.state);
          slopes[part] = linearValue(2 * part + 1, frame.state);
        }
      }
    }

    private boolean sameInputs(double[] state) {
      for (int j = 0; j < inputs.length; j++) {
        if (Double.doubleToRawLongBits(state[inputs[j]])
            != Double.doubleToRawLongBits(inputValues[j])) {
          return false;
        }
      }
      return true;
    }
  }

  @Override
  public Unknown unknown() {
    return unknown;
  }

  @Override
  public Scale scale() {
    return scale;
  }

  @Override
  public boolean smooth() {
    return smooth;
  }

  @Override
  public int termCount() {
    return terms.length;
  }

  @Override
  public double logDensity(double u, double[] state, double[] slope) {
    Workspace workspace = workspaces.get();
    workspace.prepare(state);
    return logDensity(u, state, slope, workspace, true);
  }

  /**
   * The same value and slope from the kept parts, every term evaluated alone (no {@link
   * AffineRows} loop): what the runs must equal bit for bit.
   */
  double logDensityTermByTerm(double u, double[] state, double[] slope) {
    Workspace workspace = workspaces.get();
    workspace.prepare(state);
    return logDensity(u, state, slope, workspace, false);
  }

  /** Whether some run of terms is summed by an {@link AffineRows} loop. */
  boolean summedInRuns() {
    if (runRows == null) {
      return false;
    }
    for (AffineRows rows : runRows) {
      if (rows != null) {
        return true;
      }
    }
    return false;
  }

  /**
   * The same value and slope with every part evaluated as a compiled tree at this call, nothing
   * kept from earlier calls: the reference that {@link #logDensity} must equal (to rounding).
   */
  double logDensityFromScratch(double u, double[] state, double[] slope) {
    return logDensity(u, state, slope, null, false);
  }

  private double logDensity(
      double u, double[] state, double[] slope, Workspace workspace, boolean inRuns) {
    double x = toNatural(u);
    Frame frame = workspace == null
        ? new Frame(x, state, aritiesUsed) : workspace.frame.at(x, state);
    double lo = lower.eval(frame);
    double hi = upper.eval(frame);
    if (!(x >= lo && x <= hi)) {
      if (slope != null) {
        slope[0] = 0;
      }
      return Double.NEGATIVE_INFINITY;
    }
    double total = 0;
    double dx = 0;
    double du = 0;
    boolean runs = inRuns && workspace != null && runRows != null;
    if (runs) {
      // The same sums in the same order as the loop below, runs of like terms in one loop each.
      double[] sums = workspace.sums;
      for (int r = 0; r < runRows.length; r++) {
        int i = runStart[r];
        TermEvaluator term = terms[i];
        if (runRows[r] != null) {
          sums[0] = total;
          sums[1] = dx;
          runRows[r].accumulate(x, workspace.intercepts, workspace.slopes, firstPart[i],
              runLength[r], workspace.kept, runKeptFirst[r], sums, frame.args[term.arity],
              frame.gradient[term.arity]);
          total = sums[0];
          dx = sums[1];
          continue;
        }
        total += term.eval(frame, workspace.intercepts, workspace.slopes, firstPart[i]);
        if (term.slopeOnSamplingScale) {
          du += frame.slope;
        } else {
          dx += frame.slope;
        }
      }
    }
    int count = workspace == null ? terms.length : runs ? 0 : workspace.activeCount;
    for (int j = 0; j < count; j++) {
      int i = workspace == null ? j : workspace.active[j];
      TermEvaluator term = terms[i];
      if (workspace == null && guards[i] != null && !AllocationMembers.selects(guards[i], frame)) {
        continue;
      }
      total += workspace == null ? term.eval(frame)
          : term.eval(frame, workspace.intercepts, workspace.slopes, firstPart[i]);
      if (term.slopeOnSamplingScale) {
        du += frame.slope;
      } else {
        dx += frame.slope;
      }
    }
    double logJacobian;
    double dxdu;
    double dLogJacobian;
    switch (scale) {
      case LOG:
        logJacobian = u;
        dxdu = x;
        dLogJacobian = 1;
        break;
      case LOGIT:
        logJacobian = Op.logInverseLogit(u) + Op.logInverseLogit(-u);
        dxdu = x * (1 - x);
        dLogJacobian = 1 - 2 * x;
        break;
      default:
        logJacobian = 0;
        dxdu = 1;
        dLogJacobian = 0;
    }
    double value = total + logJacobian;
    if (Double.isNaN(value)) {
      value = Double.NEGATIVE_INFINITY;
    }
    if (slope != null) {
      double s = (dx == 0 ? 0 : dx * dxdu) + du + dLogJacobian;
      // Where the density is zero (an argument underflowed or moved out of its range, say), the
      // slope has no meaning; 0 as outside the support, never NaN.
      slope[0] = value == Double.NEGATIVE_INFINITY ? 0 : s;
    }
    return value;
  }

  @Override
  public double toNatural(double u) {
    switch (scale) {
      case LOG:
        return Math.exp(u);
      case LOGIT:
        return Op.inverseLogit(u);
      default:
        return u;
    }
  }

  @Override
  public double toSamplingScale(double v) {
    switch (scale) {
      case LOG:
        return Math.log(v);
      case LOGIT:
        return Math.log(v) - Math.log1p(-v);
      default:
        return v;
    }
  }

  @Override
  public double lowerBound(double[] state) {
    if (!Double.isNaN(constantLower)) {
      return constantLower;
    }
    return toSamplingScale(
        Math.max(lower.eval(new Frame(Double.NaN, state)), cuts.lower(state)));
  }

  @Override
  public double upperBound(double[] state) {
    if (!Double.isNaN(constantUpper)) {
      return constantUpper;
    }
    return toSamplingScale(
        Math.min(upper.eval(new Frame(Double.NaN, state)), cuts.upper(state)));
  }

  /** One term {@code value ~ family(args)} of the blanket, compiled with the own unknown. */
  private static final class TermEvaluator {
    private final Parametrisation family;
    private final Evaluator value;
    private final Evaluator[] args;
    private final int[] moving;
    /** The ranges of the moving arguments whose range is bounded, else null. */
    private final ArgumentRange[] ranges;
    private final boolean valueMoves;
    private final boolean normalise;
    private final double lower;
    private final double upper;
    private final int arity;
    /**
     * On the log scale, a term whose only moving argument is {@code c x^q} gives its slope in u
     * directly as {@code q} times the family's slope in the log of that argument, so that a
     * natural-scale derivative that overflows (an sd near 1e-144: {@code S / sd^3}) never enters.
     */
    final boolean slopeOnSamplingScale;
    private final double power;
    /**
     * Per part (0 the value, 1 + k argument k): {@code a} and {@code b} of {@code a + b x} as
     * trees free of the unknown, or both {@code null} for a part that is not affine in it.
     */
    private final Evaluator[] partIntercepts;
    private final Evaluator[] partSlopes;
    /** Per part: whether it is affine in the unknown (worked out once per draw). */
    private final boolean[] affine;
    /** Whether a moving argument has a bounded range to check at every evaluation. */
    private final boolean checksRanges;
    /**
     * The family's loop over runs of such terms, where every part is affine in the unknown and
     * only one argument moves (no range to check, no normaliser, no slope on the log scale);
     * else null.
     */
    final AffineRows rows;
    /**
     * {@code a} and {@code b} of each part as linear forms ({@code 2 p}, {@code 2 p + 1}), both
     * or neither; taken by the conditional into its flat arrays, then dropped.
     */
    Formulas.LinearForm[] linearForms;

    TermEvaluator(Term term, int slot, Scale scale) {
      this.family = term.family();
      this.value = Evaluator.compile(term.value(), slot);
      this.arity = term.arguments().size();
      this.args = new Evaluator[arity];
      int movingCount = 0;
      for (int k = 0; k < arity; k++) {
        args[k] = Evaluator.compile(term.arguments().get(k), slot);
        movingCount += args[k].fixed() ? 0 : 1;
      }
      this.moving = new int[movingCount];
      for (int k = 0, m = 0; k < arity; k++) {
        if (!args[k].fixed()) {
          moving[m++] = k;
        }
      }
      this.ranges = new ArgumentRange[arity];
      for (int k : moving) {
        ArgumentRange range = family.argumentRange(k);
        ranges[k] = range.bounded() ? range : null;
      }
      this.valueMoves = !value.fixed();
      // The truncation normaliser -log(F(hi) - F(lo)) is constant unless an argument moves.
      this.normalise = term.truncated() && movingCount > 0;
      this.lower = term.lower();
      this.upper = term.upper();
      Formulas.Monomial monomial =
          movingCount == 1 ? Formulas.monomial(term.arguments().get(moving[0]), slot) : null;
      double q = monomial != null ? monomial.power() : Double.NaN;
      this.slopeOnSamplingScale = scale == Scale.LOG && !valueMoves && !normalise
          && Double.isFinite(q) && q != 0;
      this.power = q;
      this.partIntercepts = new Evaluator[1 + arity];
      this.partSlopes = new Evaluator[1 + arity];
      this.affine = new boolean[1 + arity];
      boolean anyRange = false;
      for (ArgumentRange range : ranges) {
        anyRange |= range != null;
      }
      this.checksRanges = anyRange;
      this.linearForms = new Formulas.LinearForm[2 * (1 + arity)];
      for (int p = 0; p <= arity; p++) {
        Formula part = p == 0 ? term.value() : term.arguments().get(p - 1);
        Formula[] parts = Formulas.affineParts(part, slot);
        if (parts == null) {
          continue;
        }
        affine[p] = true;
        Formulas.LinearForm a = Formulas.linearForm(parts[0]);
        Formulas.LinearForm b = a == null ? null : Formulas.linearForm(parts[1]);
        if (b != null) {
          linearForms[2 * p] = a;
          linearForms[2 * p + 1] = b;
        } else {
          partIntercepts[p] = Evaluator.compile(parts[0], -1);
          partSlopes[p] = Evaluator.compile(parts[1], -1);
        }
      }
      boolean allAffine = true;
      for (boolean a : affine) {
        allAffine &= a;
      }
      this.rows = allAffine && !valueMoves && movingCount == 1 && !normalise && !anyRange
          && !slopeOnSamplingScale ? family.affineRows(moving[0]) : null;
    }

    /** Whether {@code next} continues a run of this term's {@link AffineRows} loop. */
    boolean joins(TermEvaluator next) {
      return rows != null && next.family == family && next.moving[0] == moving[0];
    }

    /** True when an affine part's {@code a} and {@code b} are trees, not linear forms. */
    boolean preparesTrees() {
      for (Evaluator e : partIntercepts) {
        if (e != null) {
          return true;
        }
      }
      return false;
    }

    /**
     * Works out {@code a} and {@code b} of each affine part at the frame's state that is not a
     * linear form (those the conditional works out itself).
     */
    void prepare(Frame frame, double[] intercepts, double[] slopes, int first) {
      for (int p = 0; p <= arity; p++) {
        if (partIntercepts[p] != null) {
          intercepts[first + p] = partIntercepts[p].eval(frame);
          slopes[first + p] = partSlopes[p].eval(frame);
        }
      }
    }

    /** Part {@code p} at the frame's {@code x}, its slope left in {@code frame.slope}. */
    private double part(int p, Frame frame, double[] intercepts, double[] slopes, int first) {
      if (!affine[p]) {
        return p == 0 ? value.eval(frame) : args[p - 1].eval(frame);
      }
      double a = intercepts[first + p];
      double b = slopes[first + p];
      frame.slope = b;
      // A part free of the unknown is its intercept; b * x is never formed, as 0 * inf is NaN.
      return b == 0 ? a : a + b * frame.x;
    }

    /** As {@link #eval(Frame)}, with the affine parts taken from a prepared workspace. */
    double eval(Frame frame, double[] intercepts, double[] slopes, int first) {
      double y = part(0, frame, intercepts, slopes, first);
      double dy = frame.slope;
      double[] a = frame.args[arity];
      double[] da = frame.argSlopes[arity];
      for (int k = 0; k < arity; k++) {
        a[k] = part(1 + k, frame, intercepts, slopes, first);
        da[k] = frame.slope;
        if (checksRanges && ranges[k] != null && !ranges[k].contains(a[k])) {
          frame.slope = 0;
          return Double.NEGATIVE_INFINITY;
        }
      }
      return familyTerms(frame, y, dy, a, da);
    }

    double eval(Frame frame) {
      double y = value.eval(frame);
      double dy = frame.slope;
      double[] a = frame.args[arity];
      double[] da = frame.argSlopes[arity];
      for (int k = 0; k < arity; k++) {
        a[k] = args[k].eval(frame);
        da[k] = frame.slope;
        if (ranges[k] != null && !ranges[k].contains(a[k])) {
          frame.slope = 0;
          return Double.NEGATIVE_INFINITY;
        }
      }
      return familyTerms(frame, y, dy, a, da);
    }

    /** The family's log-density (and normaliser) at value {@code y} and arguments {@code a}. */
    private double familyTerms(Frame frame, double y, double dy, double[] a, double[] da) {
      double[] g = frame.gradient[arity];
      double logDensity = family.logDensity(y, a, g);
      if (slopeOnSamplingScale) {
        frame.slope = power * family.logArgumentSlope(y, a, moving[0], g);
        return logDensity;
      }
      double slope = valueMoves ? g[0] * dy : 0;
      for (int k : moving) {
        slope += g[1 + k] * da[k];
      }
      if (normalise) {
        double[] ag = frame.argGradient[arity];
        logDensity -= family.logProbabilityBetween(lower, upper, a, ag);
        for (int k : moving) {
          slope -= ag[k] * da[k];
        }
      }
      frame.slope = slope;
      return logDensity;
    }
  }
}
