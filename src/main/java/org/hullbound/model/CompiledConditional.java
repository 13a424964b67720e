package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import org.hullbound.model.family.AffineRows;
import org.hullbound.model.family.ArgumentRange;
import org.hullbound.model.family.Parametrisation;
import org.hullbound.model.family.Scale;

/**
 * A full conditional compiled from its Markov blanket: the family's own log-density (with its
 * normalising constants) per term, the truncation normaliser where the arguments move, and the
 * change of variable to the sampling scale with its log-Jacobian.
 *
 * <p>Terms grouped by shape (issues 11 and 14): the terms that differ only in numbers (the rows of
 * a statement: observed values, the constants and coefficients of their linear forms, the slots
 * those read) share one evaluator, and their numbers sit in primitive columns read by row ({@link
 * RowColumn}), with no object per row; a term whose parts are not all linear forms keeps its own
 * {@link Evaluator} trees. The blanket is read once, a term at a time, and each term dropped.
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
 * Rows of such a run with bit-equal numbers in their moving argument share one linear predictor
 * and, where the family has sufficient statistics, are evaluated once per group from sums made at
 * compile time ({@link Collapsed}): the same density to rounding, the last bits may differ.
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
  /**
   * The largest {@code |a|} and {@code |b x|} whose exponentials a factored group multiplies
   * ({@link Collapsed}): {@code exp(+-700)} are normal doubles, and the product taken (of the
   * sign that makes the exponent {@code -|eta|}) cannot overflow; where it underflows {@code
   * exp(-|eta|)} is below 1e-300 and its loss of bits costs no absolute accuracy.
   */
  static final double FACTORED_EXPONENT = 700;

  private final Unknown unknown;
  private final Scale scale;
  /**
   * The blanket's terms, made again when read, for the reference path only; null where the
   * blanket given was a list of terms held (a line's moved terms), which is not kept.
   */
  private final List<Term> blanket;
  private final int termCount;
  /**
   * The blanket's terms grouped by shape: one shared evaluator per shape, each term a row of its
   * shape's columns of numbers ({@link Shape}); term {@code i} is row {@code rowOf[i]} of shape
   * {@code shapeOf[i]}. Those two arrays are kept only where a blanket follows an allocation (its
   * members are visited by term); a fixed blanket is visited run by run, in order.
   */
  private final Shape[] shapes;
  private final int[] shapeOf;
  private final int[] rowOf;
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
  private final boolean anyGated;
  /** The member lists of a blanket that follows an allocation, or {@code null}. */
  private final AllocationMembers members;
  /**
   * The terms in blanket order as runs of consecutive rows of one shape ({@code runLength[r]} rows
   * of shape {@code runShape[r]} from row {@code runRow[r]}), summed by the shape's {@link
   * AffineRows} loop where it has one ({@code runRows[r]} not null), else a row at a time. Null
   * when a blanket follows an allocation (the active list decides then).
   */
  private final int[] runShape;
  private final int[] runRow;
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
  /**
   * Per run: its rows collapsed into groups of one linear predictor ({@link Collapsed}), or null
   * where its family keeps no sufficient statistics or no two rows share one.
   */
  private final Collapsed[] runCollapsed;
  /** Each term compiled alone, for the reference path only: made on its first call. */
  private volatile Reference reference;
  /** Whether some shape keeps only the rows its collapsed runs read ({@link #compact}). */
  private boolean compacted;
  /** The support's formulas, kept with the blanket for {@link #expanded}. */
  private final Formula lowerFormula;
  private final Formula upperFormula;
  /** This conditional with every row kept, for the term-by-term path: made on its first call. */
  private volatile CompiledConditional expanded;
  private final ThreadLocal<Workspace> workspaces = ThreadLocal.withInitial(Workspace::new);

  /**
   * Compiles the conditional of {@code unknown} from its blanket (own term first), reading each
   * term once: its numbers go to its shape's columns and the term is dropped. The list is not
   * kept, so {@link #logDensityFromScratch} is not available (a line's moved terms).
   */
  CompiledConditional(
      Unknown unknown, List<Term> blanket, Formula lower, Formula upper, ArgumentBounds cuts,
      boolean smooth) {
    this(unknown, blanket, lower, upper, cuts, smooth, true, false, true);
  }

  /**
   * As the other constructor, {@code blanket} a list that makes its terms when read ({@link
   * TermTable}), kept for the reference path; with {@code grouped} false every term is a shape of
   * its own (one evaluator a term, as before terms were grouped): the reference the grouped form
   * must equal bit for bit.
   */
  CompiledConditional(
      Unknown unknown, List<Term> blanket, Formula lower, Formula upper, ArgumentBounds cuts,
      boolean smooth, boolean grouped) {
    this(unknown, blanket, lower, upper, cuts, smooth, grouped, true, true);
  }

  private CompiledConditional(
      Unknown unknown, List<Term> blanket, Formula lower, Formula upper, ArgumentBounds cuts,
      boolean smooth, boolean grouped, boolean keepBlanket, boolean compactRows) {
    this.unknown = unknown;
    this.scale = unknown.scale();
    this.blanket = keepBlanket ? blanket : null;
    this.lowerFormula = keepBlanket ? lower : null;
    this.upperFormula = keepBlanket ? upper : null;
    int slot = unknown.index();
    this.termCount = blanket.size();
    // The blanket as runs of consecutive terms of one shape (first term, shape, its first row),
    // recorded as the terms are read: no array a term unless the blanket follows an allocation.
    RowColumn.IntList runFirst = new RowColumn.IntList();
    RowColumn.IntList runShapes = new RowColumn.IntList();
    RowColumn.IntList runFirstRow = new RowColumn.IntList();
    List<Shape> found = new ArrayList<>();
    Map<Object, Integer> byKey = new HashMap<>();
    BitSet read = new BitSet();
    MemberReads memberReads = new MemberReads();
    Set<Integer> termReads = new TreeSet<>();
    int maxArity = 0;
    for (int i = 0; i < termCount; i++) {
      Term term = blanket.get(i);
      List<Formula> guards = UnknownIndex.guards(term, slot);
      // A gated term is evaluated only while selected, so in the form it takes then.
      Term evaluated = AllocationMembers.memberForm(term, guards);
      maxArity = Math.max(maxArity, evaluated.arguments().size());
      termReads.clear();
      term.value().collectSlots(termReads);
      for (Formula a : term.arguments()) {
        a.collectSlots(termReads);
      }
      termReads.forEach(read::set);
      if (guards != null || memberReads.terms > 0) {
        // From the first gated term on; the terms before it, none gated, read again once.
        while (memberReads.terms < i) {
          memberReads.add(blanket.get(memberReads.terms), null, termReads);
        }
        memberReads.add(evaluated, guards, termReads);
      }
      TermEvaluator compiled = new TermEvaluator(evaluated, slot, scale);
      Object key = grouped ? compiled.shapeKey() : null;
      Integer known = key == null ? null : byKey.get(key);
      if (known == null) {
        known = found.size();
        found.add(new Shape(compiled.shared()));
        if (key != null) {
          byKey.put(key, known);
        }
      }
      int row = found.get(known).add(compiled.linearForms);
      if (runShapes.size == 0 || runShapes.values[runShapes.size - 1] != known) {
        runFirst.add(i);
        runShapes.add(known);
        runFirstRow.add(row);
      }
      compiled.linearForms = null;
    }
    this.shapes = found.toArray(new Shape[0]);
    for (Shape shape : shapes) {
      shape.finish();
    }
    this.aritiesUsed = new boolean[maxArity + 1];
    for (Shape shape : shapes) {
      aritiesUsed[shape.term.arity] = true;
    }
    this.lower = Evaluator.compile(lower, -1);
    this.upper = Evaluator.compile(upper, -1);
    this.cuts = cuts;
    // NaN stays NaN on every scale: the bound then moves with the state.
    this.constantLower = toSamplingScale(cuts.constantLower(lower));
    this.constantUpper = toSamplingScale(cuts.constantUpper(upper));
    this.smooth = smooth;
    read.clear(slot);
    this.inputs = read.stream().toArray();
    this.members = memberReads.terms == 0 ? null : AllocationMembers.of(termCount, slot, inputs,
        memberReads.readStart.toArray(), memberReads.reads.toArray(),
        memberReads.guardReadStart.toArray(), memberReads.guardReads.toArray(),
        memberReads.guards.build());
    this.anyGated = members != null;
    int[] first = runFirst.toArray();
    int runs = first.length;
    if (anyGated) {
      // Per term its shape and row: its members are visited by term.
      this.shapeOf = new int[termCount];
      this.rowOf = new int[termCount];
      for (int r = 0; r < runs; r++) {
        int end = r + 1 < runs ? first[r + 1] : termCount;
        for (int i = first[r]; i < end; i++) {
          shapeOf[i] = runShapes.values[r];
          rowOf[i] = runFirstRow.values[r] + i - first[r];
        }
      }
      this.runShape = null;
      this.runRow = null;
      this.runLength = null;
      this.runRows = null;
      this.runKeptFirst = null;
      this.runKeptPerDraw = null;
      this.keptCount = 0;
      this.runCollapsed = null;
    } else {
      this.shapeOf = null;
      this.rowOf = null;
      this.runShape = new int[runs];
      this.runRow = new int[runs];
      this.runLength = new int[runs];
      this.runRows = new AffineRows[runs];
      this.runKeptFirst = new int[runs];
      this.runKeptPerDraw = new boolean[runs];
      this.runCollapsed = new Collapsed[runs];
      for (int r = 0; r < runs; r++) {
        runShape[r] = runShapes.values[r];
        runRow[r] = runFirstRow.values[r];
        runLength[r] = (r + 1 < runs ? first[r + 1] : termCount) - first[r];
        Shape shape = shapes[runShape[r]];
        runRows[r] = shape.term.rows;
        runCollapsed[r] = grouped ? Collapsed.of(shape, runRow[r], runLength[r]) : null;
      }
      if (compactRows) {
        compact();
      }
      int kept = 0;
      for (int r = 0; r < runs; r++) {
        runKeptFirst[r] = kept;
        if (runRows[r] == null || runRows[r].keptPerRow() == 0) {
          continue;
        }
        kept += runRows[r].keptPerRow() * runLength[r];
        runKeptPerDraw[r] = shapes[runShape[r]].keptPerDraw();
      }
      this.keptCount = kept;
    }
  }

  /**
   * Keeps of each shape with a collapsed run only the rows a call reads (issue 14): of a collapsed
   * run each group's first row, then its rows alone in order; of its other runs every row. The
   * runs and groups then index the kept rows, so a fit of millions of rows of few linear
   * predictors holds (and works out at each draw) a row per group, not per term; the same numbers
   * are read in the same order, so the same bits. The rows dropped are read again only by {@link
   * #logDensityTermByTerm}, through {@link #expanded}.
   */
  private void compact() {
    for (int s = 0; s < shapes.length; s++) {
      boolean collapses = false;
      for (int r = 0; r < runShape.length; r++) {
        collapses |= runShape[r] == s && runCollapsed[r] != null;
      }
      if (!collapses) {
        continue;
      }
      RowColumn.IntList kept = new RowColumn.IntList();
      for (int r = 0; r < runShape.length; r++) {
        if (runShape[r] != s) {
          continue;
        }
        int start = kept.size;
        Collapsed c = runCollapsed[r];
        if (c == null) {
          for (int row = runRow[r]; row < runRow[r] + runLength[r]; row++) {
            kept.add(row);
          }
        } else {
          int[] rows = new int[c.rows.length];
          for (int g = 0; g < rows.length; g++) {
            rows[g] = kept.size;
            kept.add(c.rows[g]);
          }
          int[] aloneFrom = new int[c.aloneFrom.length];
          for (int k = 0; k < aloneFrom.length; k++) {
            aloneFrom[k] = kept.size;
            for (int row = c.aloneFrom[k]; row < c.aloneFrom[k] + c.aloneLength[k]; row++) {
              kept.add(row);
            }
          }
          runCollapsed[r] = new Collapsed(rows, c.statistics, aloneFrom, c.aloneLength, c.classOf,
              c.classGroup, c.terms);
        }
        runRow[r] = start;
        runLength[r] = kept.size - start;
      }
      shapes[s].keepRows(kept.toArray());
      compacted = true;
    }
  }

  /**
   * What {@link AllocationMembers} reads of each term of a blanket that follows an allocation: the
   * slots its evaluated form and its guards read, and the guards. Gathered only from the first
   * gated term on (with the terms before it), so that a fixed blanket of millions of rows builds
   * no such lists.
   */
  private static final class MemberReads {
    final AllocationMembers.Guards.Builder guards = new AllocationMembers.Guards.Builder();
    final RowColumn.IntList readStart = new RowColumn.IntList();
    final RowColumn.IntList reads = new RowColumn.IntList();
    final RowColumn.IntList guardReadStart = new RowColumn.IntList();
    final RowColumn.IntList guardReads = new RowColumn.IntList();
    int terms;

    MemberReads() {
      readStart.add(0);
      guardReadStart.add(0);
    }

    /** Adds the next term, in the form it is evaluated in, with its guards (null for none). */
    void add(Term evaluated, List<Formula> found, Set<Integer> scratch) {
      guards.add(found);
      scratch.clear();
      evaluated.value().collectSlots(scratch);
      for (Formula a : evaluated.arguments()) {
        a.collectSlots(scratch);
      }
      scratch.forEach(reads::add);
      readStart.add(reads.size);
      if (found != null) {
        scratch.clear();
        for (Formula g : found) {
          g.collectSlots(scratch);
        }
        scratch.forEach(guardReads::add);
      }
      guardReadStart.add(guardReads.size);
      terms++;
    }
  }

  /**
   * A run's rows collapsed by linear predictor: rows whose moving argument has bit-equal forms
   * ({@code a} and {@code b} of {@code a + b x}: the same constants, slots and coefficients) have
   * the same {@code eta} in every state, so those of a family with sufficient statistics ({@link
   * AffineRows#statisticsPerGroup}) are evaluated once per group (a row with no twin is a group
   * of one once its run collapses), from the group's sums worked out here once (every other part
   * of the rows is a number fixed for the fit, so the sums never change: rows whose value or
   * trials read another unknown are never collapsed, nor are blankets that follow an allocation,
   * which have no runs). Rows the family does not group (off its support, counts above its bound)
   * are summed one by one as before, in ranges of consecutive rows. Decided at compile time: a
   * run with no two rows alike is not collapsed and costs nothing more.
   *
   * <p>Groups of a family that factors its exponential ({@link AffineRows#factorsGroups}) are
   * also sorted into classes of one slope: groups whose {@code b} form has the same numbers have
   * the same {@code b} in every state (every patient's {@code slope} of {@code intercept + slope
   * dose + effect[clinic]} in an effect's conditional; one class per dose in a line along the
   * intercept and slope), so {@code exp(-+(a + b x)) = exp(-+a) exp(-+b x)} needs {@code exp(a)}
   * once per group and draw ({@link Workspace#factorGroups}) and {@code exp(b x)} once per class
   * and evaluation, not an exponential per group and evaluation. Only where there are at most
   * half as many classes as groups.
   *
   * @param rows per group, the row its linear predictor is read from
   * @param statistics per group, its {@link AffineRows#statisticsPerGroup} sums
   * @param aloneFrom first row of each range of rows evaluated alone
   * @param aloneLength the rows in that range
   * @param classOf per group, its class of one slope; null where the exponential is not factored
   * @param classGroup per class, a group of it (whose row its {@code b} is read from)
   * @param terms the run's rows (terms) in all
   */
  private record Collapsed(int[] rows, double[] statistics, int[] aloneFrom, int[] aloneLength,
      int[] classOf, int[] classGroup, int terms) {
    static Collapsed of(Shape shape, int from, int count) {
      AffineRows family = shape.term.rows;
      if (family == null || family.statisticsPerGroup() == 0 || count < 2
          || shape.keptPerDraw()) {
        return null;
      }
      int moving = 1 + shape.term.moving[0];
      double[][] parts = new double[shape.parts][];
      int[] strides = new int[shape.parts];
      for (int p = 0; p < shape.parts; p++) {
        if (p != moving) {
          parts[p] = shape.constants[2 * p].values;
          strides[p] = shape.constants[2 * p].stride;
        }
      }
      // Groups by a hash of the predictor's numbers, rows of one hash compared in full.
      int[] groupOf = new int[count];
      RowColumn.IntList firstRow = new RowColumn.IntList();
      RowColumn.IntList size = new RowColumn.IntList();
      RowColumn.IntList nextWithHash = new RowColumn.IntList();
      Map<Long, Integer> byHash = new HashMap<>();
      for (int j = 0; j < count; j++) {
        int row = from + j;
        if (!family.groupable(parts, strides, row)) {
          groupOf[j] = -1;
          continue;
        }
        long hash = shape.formsHash(2 * moving, 2 * moving + 1, row);
        Integer head = byHash.get(hash);
        int g = head == null ? -1 : head;
        while (g >= 0 && !shape.sameForms(2 * moving, 2 * moving + 1, firstRow.values[g], row)) {
          g = nextWithHash.values[g];
        }
        if (g < 0) {
          g = firstRow.size;
          firstRow.add(row);
          size.add(0);
          nextWithHash.add(head == null ? -1 : head);
          byHash.put(hash, g);
        }
        size.values[g]++;
        groupOf[j] = g;
      }
      boolean repeats = false;
      for (int g = 0; g < firstRow.size; g++) {
        repeats |= size.values[g] >= 2;
      }
      if (!repeats) {
        return null;
      }
      // Once a run collapses, a row with no twin is a group of one too: one loop over groups
      // with no call per range of rows alone between them.
      int groups = firstRow.size;
      int per = family.statisticsPerGroup();
      int[] rows = firstRow.toArray();
      double[] statistics = new double[groups * per];
      RowColumn.IntList aloneFrom = new RowColumn.IntList();
      RowColumn.IntList aloneLength = new RowColumn.IntList();
      for (int j = 0; j < count; j++) {
        int row = from + j;
        int g = groupOf[j];
        if (g >= 0) {
          family.addToGroup(parts, strides, row, statistics, g * per);
        } else if (j > 0 && aloneFrom.size > 0
            && aloneFrom.values[aloneFrom.size - 1] + aloneLength.values[aloneFrom.size - 1]
                == row) {
          aloneLength.values[aloneFrom.size - 1]++;
        } else {
          aloneFrom.add(row);
          aloneLength.add(1);
        }
      }
      int[] classOf = null;
      int[] classGroup = null;
      if (family.factorsGroups()) {
        classOf = new int[groups];
        RowColumn.IntList firstGroup = new RowColumn.IntList();
        RowColumn.IntList nextInClass = new RowColumn.IntList();
        Map<Long, Integer> classByHash = new HashMap<>();
        int f = 2 * moving + 1;
        for (int g = 0; g < groups; g++) {
          long hash = shape.formsHash(f, f, rows[g]);
          Integer head = classByHash.get(hash);
          int k = head == null ? -1 : head;
          while (k >= 0 && !shape.sameForms(f, f, rows[firstGroup.values[k]], rows[g])) {
            k = nextInClass.values[k];
          }
          if (k < 0) {
            k = firstGroup.size;
            firstGroup.add(g);
            nextInClass.add(head == null ? -1 : head);
            classByHash.put(hash, k);
          }
          classOf[g] = k;
        }
        classGroup = firstGroup.toArray();
        if (2 * classGroup.length > groups) {
          classOf = null;
          classGroup = null;
        }
      }
      return new Collapsed(rows, statistics, aloneFrom.toArray(), aloneLength.toArray(), classOf,
          classGroup, count);
    }

    /** The evaluations a call makes: one per group and per row alone. */
    int evaluations() {
      int alone = 0;
      for (int length : aloneLength) {
        alone += length;
      }
      return rows.length + alone;
    }
  }

  /**
   * The terms of one shape: one evaluator for every term that differs from the others only in
   * numbers (its data values, the constants and coefficients of its linear forms, the slots those
   * read), and those numbers per row in primitive columns ({@link RowColumn}), with no object per
   * row. A term whose parts are not all linear forms in the other unknowns (a tree must be kept)
   * is a shape of its own, of one row.
   */
  private static final class Shape {
    final TermEvaluator term;
    final int parts;
    /** Per form {@code 2 p} (a of part p) and {@code 2 p + 1} (b): its constant, null if none. */
    final RowColumn.Doubles[] constants;
    final RowColumn.Ints[][] slots;
    final RowColumn.Doubles[][] coefficients;
    int rows;
    /**
     * Set by {@link #finish}, read at the start of every draw instead of the evaluator and the
     * columns themselves (a draw of one of 3,600 effects otherwise touches each object anew): the
     * forms that read another unknown ({@link #varies}), whether the term keeps trees of {@code a}
     * and {@code b} ({@link TermEvaluator#preparesTrees}), and the part that moves ({@code 1 +} the
     * moving argument, or -1 where none or several do).
     */
    int[] varyingForms;
    boolean preparesTrees;
    int movingPart;

    Shape(TermEvaluator term) {
      this.term = term;
      this.parts = 1 + term.arity;
      this.constants = new RowColumn.Doubles[2 * parts];
      this.slots = new RowColumn.Ints[2 * parts][];
      this.coefficients = new RowColumn.Doubles[2 * parts][];
    }

    /** Adds a term's linear forms as the next row; returns the row. */
    int add(Formulas.LinearForm[] forms) {
      for (int f = 0; f < forms.length; f++) {
        Formulas.LinearForm form = forms[f];
        if (form == null) {
          continue;
        }
        if (constants[f] == null) {
          constants[f] = new RowColumn.Doubles();
          slots[f] = new RowColumn.Ints[form.slots().length];
          coefficients[f] = new RowColumn.Doubles[form.slots().length];
          for (int e = 0; e < slots[f].length; e++) {
            slots[f][e] = new RowColumn.Ints();
            coefficients[f][e] = new RowColumn.Doubles();
          }
        }
        constants[f].add(form.constant());
        for (int e = 0; e < slots[f].length; e++) {
          slots[f][e].add(form.slots()[e]);
          coefficients[f][e].add(form.coefficients()[e]);
        }
      }
      return rows++;
    }

    void finish() {
      RowColumn.IntList varying = new RowColumn.IntList();
      for (int f = 0; f < constants.length; f++) {
        if (constants[f] != null) {
          constants[f].finish();
          for (int e = 0; e < slots[f].length; e++) {
            slots[f][e].finish();
            coefficients[f][e].finish();
          }
        }
        if (varies(f)) {
          varying.add(f);
        }
      }
      varyingForms = varying.toArray();
      preparesTrees = term.preparesTrees();
      movingPart = term.moving.length == 1 ? 1 + term.moving[0] : -1;
    }

    /** Keeps rows {@code kept} only, in that order: row {@code k} is then row {@code kept[k]}. */
    void keepRows(int[] kept) {
      for (int f = 0; f < constants.length; f++) {
        if (constants[f] != null) {
          constants[f] = constants[f].select(kept);
          for (int e = 0; e < slots[f].length; e++) {
            slots[f][e] = slots[f][e].select(kept);
            coefficients[f][e] = coefficients[f][e].select(kept);
          }
        }
      }
      rows = kept.length;
    }

    /** Whether form {@code f} is a linear form that reads another unknown (worked out per draw). */
    boolean varies(int f) {
      return constants[f] != null && slots[f].length > 0;
    }

    /**
     * Whether the rows' kept numbers must be worked out at each draw: some part but the moving
     * argument is not a constant linear form.
     */
    boolean keptPerDraw() {
      for (int p = 0; p < parts; p++) {
        if (p != 1 + term.moving[0]
            && (constants[2 * p] == null || varies(2 * p) || varies(2 * p + 1))) {
          return true;
        }
      }
      return false;
    }

    /**
     * A hash of the bits of forms {@code first .. last} at row {@code r} (part {@code p}'s {@code
     * a} and {@code b} are forms {@code 2 p} and {@code 2 p + 1}).
     */
    long formsHash(int first, int last, int r) {
      long hash = 17;
      for (int f = first; f <= last; f++) {
        hash = 31 * hash + Double.doubleToRawLongBits(constants[f].at(r));
        for (int e = 0; e < slots[f].length; e++) {
          hash = 31 * hash + slots[f][e].at(r);
          hash = 31 * hash + Double.doubleToRawLongBits(coefficients[f][e].at(r));
        }
      }
      return hash;
    }

    /** Whether forms {@code first .. last} hold the same bits at rows {@code r} and {@code t}. */
    boolean sameForms(int first, int last, int r, int t) {
      for (int f = first; f <= last; f++) {
        if (Double.doubleToRawLongBits(constants[f].at(r))
            != Double.doubleToRawLongBits(constants[f].at(t))) {
          return false;
        }
        for (int e = 0; e < slots[f].length; e++) {
          if (slots[f][e].at(r) != slots[f][e].at(t)
              || Double.doubleToRawLongBits(coefficients[f][e].at(r))
                  != Double.doubleToRawLongBits(coefficients[f][e].at(t))) {
            return false;
          }
        }
      }
      return true;
    }

    /**
     * {@code constant + sum of coefficient * state[slot]} of form {@code f} at rows {@code from ..
     * to - 1} into {@code column[from .. to - 1]}, one pass per entry of the form over the rows
     * rather than one call a row: the same additions in the same order in each row, so the same
     * bits, with an entry that reads one slot in every row (the {@code intercept} of every
     * patient) read once.
     */
    void linearValues(int f, int from, int to, double[] state, double[] column) {
      double[] constant = constants[f].values;
      int constantStride = constants[f].stride;
      for (int r = from; r < to; r++) {
        column[r] = constant[r * constantStride];
      }
      for (int e = 0; e < slots[f].length; e++) {
        double[] coefficient = coefficients[f][e].values;
        int coefficientStride = coefficients[f][e].stride;
        int[] slot = slots[f][e].values;
        if (slots[f][e].stride == 0) {
          double value = state[slot[0]];
          for (int r = from; r < to; r++) {
            column[r] += coefficient[r * coefficientStride] * value;
          }
        } else {
          for (int r = from; r < to; r++) {
            column[r] += coefficient[r * coefficientStride] * state[slot[r]];
          }
        }
      }
    }
  }

  /** Whether some term's blanket membership follows an allocation ({@link UnknownIndex}). */
  boolean dynamicBlanket() {
    return anyGated;
  }

  /** How many shapes (shared evaluators) the blanket's terms were grouped into. */
  int shapeCount() {
    return shapes.length;
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

  /**
   * One thread's scratch space: a reused frame, the inputs the parts were worked out at, and per
   * shape and part the columns its {@code a} and {@code b} ({@code part = a + b x}) are read from
   * in the current draw: the shape's own column where the form is a constant, a column of this
   * workspace where it reads another unknown.
   */
  private final class Workspace implements AllocationMembers.Preparation {
    final Frame frame = new Frame(Double.NaN, null, aritiesUsed);
    final double[] inputValues = new double[inputs.length];
    final double[][][] intercepts = new double[shapes.length][][];
    final int[][] interceptStrides = new int[shapes.length][];
    final double[][][] slopes = new double[shapes.length][][];
    final int[][] slopeStrides = new int[shapes.length][];
    /** The terms this draw evaluates, {@code active[0 .. activeCount)}, in blanket order. */
    final int[] active = anyGated ? new int[termCount] : null;
    int activeCount = termCount;
    /** The running value and slope handed to an {@link AffineRows} loop and back. */
    final double[] sums = new double[2];
    /** The runs' kept numbers ({@link AffineRows#keep}). */
    final double[] kept = new double[keptCount];
    /**
     * Per run whose groups factor their exponential (else null): {@code exp(a)} and {@code
     * exp(-a)} of each group's intercept at this draw's state, and {@code exp(b x)}, {@code
     * exp(-b x)} and {@code b} of each class at the evaluation's {@code x}; whether this draw's intercepts all
     * lie within {@link #FACTORED_EXPONENT} (else the run is evaluated unfactored).
     */
    final double[][] groupExponentials =
        runCollapsed == null ? null : new double[runCollapsed.length][];
    final double[][] classExponentials =
        runCollapsed == null ? null : new double[runCollapsed.length][];
    final boolean[] factored = runCollapsed == null ? null : new boolean[runCollapsed.length];
    boolean ready;
    /** The members of a blanket that follows an allocation, kept up to date, or null. */
    final AllocationMembers.Tracker tracker = members == null ? null : members.tracker();

    Workspace() {
      for (int s = 0; s < shapes.length; s++) {
        Shape shape = shapes[s];
        intercepts[s] = new double[shape.parts][];
        interceptStrides[s] = new int[shape.parts];
        slopes[s] = new double[shape.parts][];
        slopeStrides[s] = new int[shape.parts];
        for (int p = 0; p < shape.parts; p++) {
          if (shape.constants[2 * p] != null) {
            column(shape, 2 * p, intercepts[s], interceptStrides[s], p);
            column(shape, 2 * p + 1, slopes[s], slopeStrides[s], p);
          } else if (shape.term.affine[p]) {
            // a and b as trees, worked out per draw (a shape of one row)
            intercepts[s][p] = new double[1];
            slopes[s][p] = new double[1];
          }
        }
      }
      keep(false);
      for (int r = 0; runCollapsed != null && r < runCollapsed.length; r++) {
        if (runCollapsed[r] != null && runCollapsed[r].classOf != null) {
          groupExponentials[r] = new double[2 * runCollapsed[r].rows.length];
          classExponentials[r] = new double[3 * runCollapsed[r].classGroup.length];
        }
      }
    }

    /**
     * {@code exp(a)} and {@code exp(-a)} of each group's intercept {@code a} in the runs that
     * factor their groups' exponential, at the state just prepared: one exponential and one
     * division per group and draw. A run with an intercept beyond {@link #FACTORED_EXPONENT} is
     * evaluated unfactored in this draw (its factors could overflow or lose their bits).
     */
    void factorGroups() {
      for (int r = 0; groupExponentials != null && r < groupExponentials.length; r++) {
        double[] exponentials = groupExponentials[r];
        if (exponentials == null) {
          continue;
        }
        int s = runShape[r];
        int moving = shapes[s].movingPart;
        double[] as = intercepts[s][moving];
        int as0 = interceptStrides[s][moving];
        int[] rows = runCollapsed[r].rows;
        boolean inside = true;
        for (int g = 0; g < rows.length; g++) {
          double a = as[rows[g] * as0];
          inside &= Math.abs(a) <= FACTORED_EXPONENT;
          double up = Math.exp(a);
          exponentials[2 * g] = up;
          exponentials[2 * g + 1] = 1.0 / up;
        }
        factored[r] = inside;
      }
    }

    /**
     * {@code exp(b x)}, {@code exp(-b x)} and {@code b} of each slope class of run {@code r} at
     * {@code x};
     * false (the run then evaluated unfactored) where some {@code |b x|} exceeds {@link
     * #FACTORED_EXPONENT} or the draw's intercepts did.
     */
    boolean factorClasses(int r, double x) {
      if (!factored[r]) {
        return false;
      }
      int s = runShape[r];
      int moving = shapes[s].movingPart;
      double[] bs = slopes[s][moving];
      int bs0 = slopeStrides[s][moving];
      int[] rows = runCollapsed[r].rows;
      int[] classGroup = runCollapsed[r].classGroup;
      double[] exponentials = classExponentials[r];
      for (int k = 0; k < classGroup.length; k++) {
        double b = bs[rows[classGroup[k]] * bs0];
        // a part free of the unknown has b x = 0, never 0 * inf
        double bx = b == 0 ? 0.0 : b * x;
        if (!(Math.abs(bx) <= FACTORED_EXPONENT)) {
          return false;
        }
        double up = Math.exp(bx);
        exponentials[3 * k] = up;
        exponentials[3 * k + 1] = 1.0 / up;
        exponentials[3 * k + 2] = b;
      }
      return true;
    }

    private void column(Shape shape, int f, double[][] into, int[] strides, int p) {
      if (shape.varies(f)) {
        into[p] = new double[shape.rows];
        strides[p] = 1;
      } else {
        into[p] = shape.constants[f].values;
        strides[p] = shape.constants[f].stride;
      }
    }

    /** Works out the kept numbers of the runs that keep them once, or of those kept per draw. */
    void keep(boolean perDraw) {
      for (int r = 0; runRows != null && r < runRows.length; r++) {
        if (runRows[r] != null && runRows[r].keptPerRow() > 0 && runKeptPerDraw[r] == perDraw) {
          int s = runShape[r];
          runRows[r].keep(intercepts[s], interceptStrides[s], runRow[r], runLength[r], kept,
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
      for (int s = 0; s < shapes.length; s++) {
        prepare(s, 0, shapes[s].rows);
      }
      keep(true);
      factorGroups();
      for (int j = 0; j < inputs.length; j++) {
        inputValues[j] = state[inputs[j]];
      }
      ready = true;
    }

    /** Term {@code i}'s prepared parts at the frame's state ({@link AllocationMembers}). */
    @Override
    public void prepare(int i) {
      prepare(shapeOf[i], rowOf[i], rowOf[i] + 1);
    }

    /**
     * Works out at the frame's state the parts of rows {@code from .. to - 1} of shape {@code s}
     * that read another unknown: its trees (a shape of one row) and its varying linear forms.
     */
    private void prepare(int s, int from, int to) {
      Shape shape = shapes[s];
      if (shape.preparesTrees) {
        shape.term.prepare(frame, intercepts[s], slopes[s]);
      }
      for (int f : shape.varyingForms) {
        double[] column = (f & 1) == 0 ? intercepts[s][f >> 1] : slopes[s][f >> 1];
        shape.linearValues(f, from, to, frame.state, column);
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

    /** Term {@code i} at the frame's {@code x} from the prepared parts; slope in the frame. */
    double eval(int i) {
      int s = shapeOf[i];
      return shapes[s].term.eval(frame, intercepts[s], interceptStrides[s], slopes[s],
          slopeStrides[s], rowOf[i]);
    }
  }

  /** Every term compiled alone with its guards: the reference path's terms, nothing shared. */
  private record Reference(TermEvaluator[] terms, Evaluator[][] guards) {}

  private Reference reference() {
    Reference r = reference;
    if (r == null) {
      if (blanket == null) {
        throw new IllegalStateException("a conditional compiled from held terms has no reference");
      }
      TermEvaluator[] terms = new TermEvaluator[termCount];
      Evaluator[][] guards = new Evaluator[termCount][];
      for (int i = 0; i < termCount; i++) {
        Term term = blanket.get(i);
        List<Formula> found = UnknownIndex.guards(term, unknown.index());
        if (found != null) {
          guards[i] = found.stream().map(f -> Evaluator.compile(f, -1)).toArray(Evaluator[]::new);
        }
        terms[i] = new TermEvaluator(
            AllocationMembers.memberForm(term, found), unknown.index(), scale);
      }
      r = new Reference(terms, guards);
      reference = r;
    }
    return r;
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
    return termCount;
  }

  @Override
  public double logDensity(double u, double[] state, double[] slope) {
    Workspace workspace = workspaces.get();
    workspace.prepare(state);
    return logDensity(u, state, slope, workspace, true);
  }

  /**
   * A view with a workspace of its own, made on its first evaluation (see the interface), for a
   * conditional of at most {@value #ONE_CHAIN_TERMS} terms; a larger one stays with the thread's:
   * its evaluations dwarf the lookup, and a workspace per chain rather than per worker thread
   * (more chains than processors) would hold more of its per-row columns.
   */
  @Override
  public ConditionalDensity forOneChain() {
    return termCount > ONE_CHAIN_TERMS ? this : new OneChain();
  }

  /** The most terms a conditional has for {@link #forOneChain} to give it a workspace per chain. */
  static final int ONE_CHAIN_TERMS = 1024;

  /** This conditional with its own workspace in place of the thread's: the same arithmetic. */
  private final class OneChain implements ConditionalDensity {
    private Workspace workspace;

    @Override
    public double logDensity(double u, double[] state, double[] slope) {
      Workspace own = workspace;
      if (own == null) {
        own = new Workspace();
        workspace = own;
      }
      own.prepare(state);
      return CompiledConditional.this.logDensity(u, state, slope, own, true);
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
    public double toNatural(double u) {
      return CompiledConditional.this.toNatural(u);
    }

    @Override
    public double toSamplingScale(double v) {
      return CompiledConditional.this.toSamplingScale(v);
    }

    @Override
    public double lowerBound(double[] state) {
      return CompiledConditional.this.lowerBound(state);
    }

    @Override
    public double upperBound(double[] state) {
      return CompiledConditional.this.upperBound(state);
    }

    @Override
    public boolean smooth() {
      return smooth;
    }

    @Override
    public int termCount() {
      return termCount;
    }
  }

  /**
   * The same value and slope from the kept parts, every term evaluated alone (no {@link
   * AffineRows} loop): what the runs must equal bit for bit. Where rows were compacted ({@link
   * #compact}), those of the same conditional compiled with every row kept.
   */
  double logDensityTermByTerm(double u, double[] state, double[] slope) {
    if (compacted) {
      return expanded().logDensityTermByTerm(u, state, slope);
    }
    Workspace workspace = workspaces.get();
    workspace.prepare(state);
    return logDensity(u, state, slope, workspace, false);
  }

  /** How many rows its shapes hold in all: its terms, or fewer where rows were compacted. */
  int heldRows() {
    int rows = 0;
    for (Shape shape : shapes) {
      rows += shape.rows;
    }
    return rows;
  }

  /** This conditional compiled again from its blanket with every row kept (tests only). */
  CompiledConditional expanded() {
    CompiledConditional c = expanded;
    if (c == null) {
      if (blanket == null) {
        throw new IllegalStateException("a conditional compiled from held terms keeps no rows");
      }
      c = new CompiledConditional(unknown, blanket, lowerFormula, upperFormula, cuts, smooth,
          true, true, false);
      expanded = c;
    }
    return c;
  }

  /**
   * The evaluations of terms or groups one call makes where runs are summed: a collapsed run
   * counts one per group of one linear predictor and one per row alone ({@link Collapsed});
   * {@link #termCount} when nothing is collapsed.
   */
  int evaluationsPerCall() {
    if (runCollapsed == null) {
      return termCount;
    }
    int total = termCount;
    for (int r = 0; r < runCollapsed.length; r++) {
      if (runCollapsed[r] != null && runRows[r] != null) {
        total += runCollapsed[r].evaluations() - runCollapsed[r].terms;
      }
    }
    return total;
  }

  /**
   * The classes of one slope over the runs whose groups factor their exponential ({@link
   * Collapsed}); 0 where none does.
   */
  int slopeClasses() {
    int classes = 0;
    for (int r = 0; runCollapsed != null && r < runCollapsed.length; r++) {
      if (runCollapsed[r] != null && runCollapsed[r].classGroup != null) {
        classes += runCollapsed[r].classGroup.length;
      }
    }
    return classes;
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
   * The same value and slope with every term compiled alone (made again from the blanket on the
   * first call) and every part evaluated as a compiled tree at this call, nothing kept from
   * earlier calls: the reference that {@link #logDensity} must equal (to rounding).
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
      return outsideSupport(slope);
    }
    double total = 0;
    double dx = 0;
    double du = 0;
    boolean runs = workspace != null && runRows != null;
    if (runs) {
      // The same sums in the same order, runs of like terms in one loop each or a term at a time.
      double[] sums = workspace.sums;
      for (int r = 0; r < runRows.length; r++) {
        int s = runShape[r];
        TermEvaluator term = shapes[s].term;
        if (inRuns && runRows[r] != null) {
          sums[0] = total;
          sums[1] = dx;
          Collapsed collapsed = runCollapsed[r];
          if (collapsed == null) {
            runRows[r].accumulate(x, workspace.intercepts[s], workspace.interceptStrides[s],
                workspace.slopes[s], workspace.slopeStrides[s], runRow[r], runLength[r],
                workspace.kept, runKeptFirst[r], sums, frame.args[term.arity],
                frame.gradient[term.arity]);
          } else {
            // The groups first, then the rows alone: the same terms in another order.
            if (collapsed.classOf != null && workspace.factorClasses(r, x)) {
              runRows[r].accumulateFactoredGroups(x, workspace.intercepts[s],
                  workspace.interceptStrides[s], workspace.slopes[s], workspace.slopeStrides[s],
                  collapsed.rows, collapsed.rows.length, collapsed.statistics,
                  workspace.groupExponentials[r], collapsed.classOf,
                  workspace.classExponentials[r], sums);
            } else {
              runRows[r].accumulateGroups(x, workspace.intercepts[s],
                  workspace.interceptStrides[s], workspace.slopes[s], workspace.slopeStrides[s],
                  collapsed.rows, collapsed.rows.length, collapsed.statistics, sums);
            }
            int keptPerRow = runRows[r].keptPerRow();
            for (int k = 0; k < collapsed.aloneFrom.length; k++) {
              int from = collapsed.aloneFrom[k];
              runRows[r].accumulate(x, workspace.intercepts[s], workspace.interceptStrides[s],
                  workspace.slopes[s], workspace.slopeStrides[s], from,
                  collapsed.aloneLength[k], workspace.kept,
                  runKeptFirst[r] + (from - runRow[r]) * keptPerRow, sums,
                  frame.args[term.arity], frame.gradient[term.arity]);
            }
          }
          total = sums[0];
          dx = sums[1];
          continue;
        }
        for (int row = runRow[r]; row < runRow[r] + runLength[r]; row++) {
          total += term.eval(frame, workspace.intercepts[s], workspace.interceptStrides[s],
              workspace.slopes[s], workspace.slopeStrides[s], row);
          if (term.slopeOnSamplingScale) {
            du += frame.slope;
          } else {
            dx += frame.slope;
          }
        }
      }
    }
    Reference alone = workspace == null ? reference() : null;
    int count = workspace == null ? termCount : runs ? 0 : workspace.activeCount;
    for (int j = 0; j < count; j++) {
      int i = workspace == null ? j : workspace.active[j];
      TermEvaluator term;
      if (workspace == null) {
        term = alone.terms[i];
        if (alone.guards[i] != null && !AllocationMembers.selects(alone.guards[i], frame)) {
          continue;
        }
        total += term.eval(frame);
      } else {
        term = shapes[shapeOf[i]].term;
        total += workspace.eval(i);
      }
      if (term.slopeOnSamplingScale) {
        du += frame.slope;
      } else {
        dx += frame.slope;
      }
    }
    return withJacobian(scale, u, x, total, dx, du, slope);
  }

  /** The value outside the support, {@code -inf}, with a slope of 0. */
  static double outsideSupport(double[] slope) {
    if (slope != null) {
      slope[0] = 0;
    }
    return Double.NEGATIVE_INFINITY;
  }

  /**
   * The conditional's value and slope on the sampling scale from the terms' sum {@code total} and
   * its slopes in {@code x} ({@code dx}) and in {@code u} ({@code du}): the log-Jacobian added,
   * NaN taken as {@code -inf}, the slope 0 where the density is 0.
   */
  static double withJacobian(
      Scale scale, double u, double x, double total, double dx, double du, double[] slope) {
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
  static final class TermEvaluator {
    private final Parametrisation family;
    /** The value's and arguments' trees; dropped by {@link #shared} (every part a linear form). */
    private Evaluator value;
    private Evaluator[] args;
    private final int[] moving;
    /** The ranges of the moving arguments whose range is bounded, else null. */
    private final ArgumentRange[] ranges;
    private final boolean valueMoves;
    private final boolean normalise;
    private final double lower;
    private final double upper;
    final int arity;
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
    final boolean[] affine;
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
      this(term, slot, scale, null);
    }

    /**
     * As {@link #TermEvaluator(Term, int, Scale)}, the value's and arguments' leaves replaced as
     * {@link Evaluator#compile(Formula, int, java.util.function.Function)} does (value first,
     * then the arguments in order): a template evaluated by {@link #eval(Frame)} at a row.
     */
    TermEvaluator(Term term, int slot, Scale scale,
        java.util.function.Function<Formula, Evaluator> leaves) {
      this.family = term.family();
      this.value = Evaluator.compile(term.value(), slot, leaves);
      this.arity = term.arguments().size();
      this.args = new Evaluator[arity];
      int movingCount = 0;
      for (int k = 0; k < arity; k++) {
        args[k] = Evaluator.compile(term.arguments().get(k), slot, leaves);
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

    /**
     * What every term that may share this evaluator has in common, or {@code null} when a part is
     * not a linear form in the other unknowns (a tree must be kept per term): the family, which
     * arguments move, the flags of the evaluation, the truncation bounds, and the number of
     * entries of each linear form. Terms with equal keys differ only in their forms' numbers.
     */
    Object shapeKey() {
      StringBuilder key = new StringBuilder();
      for (int f = 0; f < linearForms.length; f++) {
        if (linearForms[f] == null) {
          return null;
        }
        key.append(linearForms[f].slots().length).append(',');
      }
      key.append(Arrays.toString(moving)).append(valueMoves).append(normalise)
          .append(Double.doubleToRawLongBits(lower)).append(',')
          .append(Double.doubleToRawLongBits(upper)).append(slopeOnSamplingScale)
          .append(Double.doubleToRawLongBits(power));
      return List.of(family, key.toString());
    }

    /**
     * This evaluator as the one its shape's terms share: without its own trees when every part is
     * a linear form (the shape's columns hold the numbers), else as it is (a shape of one row).
     */
    TermEvaluator shared() {
      if (shapeKey() != null) {
        value = null;
        args = null;
      }
      return this;
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
     * linear form (those the conditional works out itself), into row 0 of its columns: such a term
     * is a shape of one row.
     */
    void prepare(Frame frame, double[][] intercepts, double[][] slopes) {
      for (int p = 0; p <= arity; p++) {
        if (partIntercepts[p] != null) {
          intercepts[p][0] = partIntercepts[p].eval(frame);
          slopes[p][0] = partSlopes[p].eval(frame);
        }
      }
    }

    /** Part {@code p} of row {@code row} at the frame's {@code x}, its slope in the frame. */
    private double part(int p, Frame frame, double[][] intercepts, int[] interceptStrides,
        double[][] slopes, int[] slopeStrides, int row) {
      if (!affine[p]) {
        return p == 0 ? value.eval(frame) : args[p - 1].eval(frame);
      }
      double a = intercepts[p][row * interceptStrides[p]];
      double b = slopes[p][row * slopeStrides[p]];
      frame.slope = b;
      // A part free of the unknown is its intercept; b * x is never formed, as 0 * inf is NaN.
      return b == 0 ? a : a + b * frame.x;
    }

    /**
     * As {@link #eval(Frame)} for row {@code row} of its shape, with the affine parts taken from
     * a prepared workspace's columns.
     */
    double eval(Frame frame, double[][] intercepts, int[] interceptStrides, double[][] slopes,
        int[] slopeStrides, int row) {
      double y = part(0, frame, intercepts, interceptStrides, slopes, slopeStrides, row);
      double dy = frame.slope;
      double[] a = frame.args[arity];
      double[] da = frame.argSlopes[arity];
      for (int k = 0; k < arity; k++) {
        a[k] = part(1 + k, frame, intercepts, interceptStrides, slopes, slopeStrides, row);
        da[k] = frame.slope;
        if (checksRanges && ranges[k] != null && !ranges[k].contains(a[k])) {
          frame.slope = 0;
          return Double.NEGATIVE_INFINITY;
        }
      }
      return familyTerms(frame, y, dy, a, da);
    }

    /** The term at the frame's {@code x} and state, every part a tree; slope in the frame. */
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
