package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.IntFunction;
import org.hullbound.model.family.Scale;

/**
 * The conditionals of the allocations of one name ({@code cohort_of[shell]} in {@code
 * centre[cohort_of[shell]]}), compiled once for all its elements: each term of an allocation's
 * blanket (its prior, the rows that read it) is one template shared by every allocation, whose
 * numbers (the observed value, a covariate, the slot of another unknown) that differ between
 * allocations sit in primitive columns read at the allocation's row ({@link RowColumn}, {@link
 * Evaluator#rowNumber}). An allocation's draw evaluates its row of the templates; there is no
 * compiled conditional, workspace or thread-local per allocation, only a small view ({@link
 * #conditional}) that names its row.
 *
 * <p>Why (issue 11): with a compiled conditional per allocation, each with its evaluators, its
 * workspace and its thread-local, a mixture of 10,000 rows held tens of megabytes of small objects
 * that a sweep visits once each; out of the caches, the sweep's cost grew as rows^1.5.
 *
 * <p>Applies when every allocation of the name is a whole-valued unknown on the natural scale
 * whose blanket has the same terms in the same order, each with the same structure (family,
 * operations, where the own unknown enters, truncation bounds) and constant, equal support
 * bounds; otherwise {@link #of} gives {@code null} and each allocation is compiled alone. A row of
 * the templates is the same tree over the same numbers as that allocation's own compiled term
 * evaluated as a tree, summed in the same order (own term first), so a value equals the
 * conditional compiled alone evaluated term by term.
 */
final class AllocationRows {
  /** Per blanket position: the template, and its leaves' columns. */
  private final CompiledConditional.TermEvaluator[] terms;
  /** The allocations' slots, ascending; row r is slot {@code slots[r]}. */
  private final int[] slots;
  private final List<Unknown> unknowns;
  private final double supportLower;
  private final double supportUpper;
  private final double lower;
  private final double upper;
  private final boolean smooth;
  private final ThreadLocal<Frame> frames;

  private AllocationRows(CompiledConditional.TermEvaluator[] terms, List<Unknown> unknowns,
      double supportLower, double supportUpper, double lower, double upper, boolean smooth) {
    this.terms = terms;
    this.unknowns = unknowns;
    this.slots = unknowns.stream().mapToInt(Unknown::index).toArray();
    this.supportLower = supportLower;
    this.supportUpper = supportUpper;
    this.lower = lower;
    this.upper = upper;
    this.smooth = smooth;
    boolean[] arities = new boolean[1 + Arrays.stream(terms).mapToInt(t -> t.arity).max()
        .orElse(0)];
    for (CompiledConditional.TermEvaluator t : terms) {
      arities[t.arity] = true;
    }
    this.frames = ThreadLocal.withInitial(() -> new Frame(Double.NaN, null, arities));
  }

  /** What an allocation's conditional needs besides its blanket. */
  record Facts(Formula lower, Formula upper, ArgumentBounds cuts, boolean smooth) {}

  /**
   * The shared conditionals of {@code allocations} (ascending slots of one name), or {@code null}
   * when their blankets differ in structure.
   *
   * @param blanket the blanket of a slot, own term first, its terms made when read
   * @param facts the bounds and smoothness of a slot
   */
  static AllocationRows of(List<Unknown> allocations, IntFunction<List<Term>> blanket,
      IntFunction<Facts> facts) {
    if (allocations.isEmpty()) {
      return null;
    }
    Unknown first = allocations.get(0);
    List<Term> firstTerms = List.copyOf(blanket.apply(first.index()));
    Facts firstFacts = facts.apply(first.index());
    double[] bounds = bounds(firstFacts);
    if (bounds == null || first.scale() != Scale.NATURAL) {
      return null;
    }
    int width = firstTerms.size();
    List<Object> keys = new ArrayList<>();
    List<List<RowColumn.Doubles>> numbers = new ArrayList<>();
    List<List<RowColumn.Ints>> others = new ArrayList<>();
    for (Term t : firstTerms) {
      keys.add(key(t, first.index()));
      numbers.add(new ArrayList<>());
      others.add(new ArrayList<>());
    }
    for (Unknown u : allocations) {
      List<Term> terms = blanket.apply(u.index());
      Facts f = facts.apply(u.index());
      if (u.scale() != Scale.NATURAL || !u.discrete() || terms.size() != width
          || f.smooth() != firstFacts.smooth() || !Arrays.equals(bounds(f), bounds)) {
        return null;
      }
      for (int t = 0; t < width; t++) {
        Term term = terms.get(t);
        if (!key(term, u.index()).equals(keys.get(t))) {
          return null;
        }
        int[] counters = new int[2];
        collect(term.value(), u.index(), numbers.get(t), others.get(t), counters);
        for (Formula a : term.arguments()) {
          collect(a, u.index(), numbers.get(t), others.get(t), counters);
        }
      }
    }
    CompiledConditional.TermEvaluator[] templates =
        new CompiledConditional.TermEvaluator[width];
    for (int t = 0; t < width; t++) {
      numbers.get(t).forEach(RowColumn.Doubles::finish);
      others.get(t).forEach(RowColumn.Ints::finish);
      int[] next = new int[2];
      List<RowColumn.Doubles> n = numbers.get(t);
      List<RowColumn.Ints> o = others.get(t);
      // The first allocation's term, its leaves that differ between rows read from the columns.
      templates[t] = new CompiledConditional.TermEvaluator(firstTerms.get(t), first.index(),
          Scale.NATURAL, leaf -> {
            if (leaf instanceof Formula.Constant) {
              RowColumn.Doubles c = n.get(next[0]++);
              return c.stride == 0 ? null : Evaluator.rowNumber(c.values);
            }
            RowColumn.Ints c = o.get(next[1]++);
            return c.stride == 0 ? null : Evaluator.rowSlot(c.values);
          });
      templates[t].linearForms = null;
    }
    return new AllocationRows(templates, List.copyOf(allocations), bounds[0], bounds[1],
        bounds[2], bounds[3], firstFacts.smooth());
  }

  /** The support's bounds and the cut bounds when all are constants, else {@code null}. */
  private static double[] bounds(Facts f) {
    if (!(f.lower() instanceof Formula.Constant lo) || !(f.upper() instanceof Formula.Constant hi)
        || !f.cuts().fixed()) {
      return null;
    }
    return new double[] {lo.value(), hi.value(), f.cuts().constantLower(lo),
        f.cuts().constantUpper(hi)};
  }

  /**
   * What a template holds of a term: the family, the truncation bounds and each formula's
   * structure, with its numbers and the other unknowns' slots as holes and the own unknown marked.
   */
  private static Object key(Term t, int own) {
    StringBuilder shape = new StringBuilder();
    skeleton(t.value(), own, shape);
    for (Formula a : t.arguments()) {
      shape.append(';');
      skeleton(a, own, shape);
    }
    shape.append(Double.doubleToRawLongBits(t.lower())).append(',')
        .append(Double.doubleToRawLongBits(t.upper()));
    return List.of(t.family(), shape.toString());
  }

  private static void skeleton(Formula f, int own, StringBuilder into) {
    if (f instanceof Formula.Constant) {
      into.append('#');
    } else if (f instanceof Formula.Slot s) {
      into.append(s.index() == own ? 'x' : '$');
    } else {
      Formula.Operation o = (Formula.Operation) f;
      into.append(o.op().name()).append('(');
      for (Formula part : o.parts()) {
        skeleton(part, own, into);
        into.append(' ');
      }
      into.append(')');
    }
  }

  /** Adds a row's leaves to the columns, in {@link Evaluator#compile}'s order of leaves. */
  private static void collect(Formula f, int own, List<RowColumn.Doubles> numbers,
      List<RowColumn.Ints> others, int[] counters) {
    if (f instanceof Formula.Constant c) {
      if (numbers.size() == counters[0]) {
        numbers.add(new RowColumn.Doubles());
      }
      numbers.get(counters[0]++).add(c.value());
    } else if (f instanceof Formula.Slot s) {
      if (s.index() != own) {
        if (others.size() == counters[1]) {
          others.add(new RowColumn.Ints());
        }
        others.get(counters[1]++).add(s.index());
      }
    } else {
      for (Formula part : ((Formula.Operation) f).parts()) {
        collect(part, own, numbers, others, counters);
      }
    }
  }

  /** The conditional of the allocation in slot {@code slot}: a view of its row. */
  ConditionalDensity conditional(int slot) {
    int row = Arrays.binarySearch(slots, slot);
    if (row < 0) {
      throw new IllegalArgumentException("slot must be one of these allocations, got " + slot);
    }
    return new Row(row);
  }

  /** The own term and the rows that read the allocation of row {@code row}, as trees. */
  double logDensity(int row, double u, double[] state, double[] slope) {
    Frame frame = frames.get().at(u, state);
    frame.row = row;
    double x = u;
    if (!(x >= supportLower && x <= supportUpper)) {
      return CompiledConditional.outsideSupport(slope);
    }
    double total = 0;
    double dx = 0;
    double du = 0;
    for (CompiledConditional.TermEvaluator term : terms) {
      total += term.eval(frame);
      if (term.slopeOnSamplingScale) {
        du += frame.slope;
      } else {
        dx += frame.slope;
      }
    }
    return CompiledConditional.withJacobian(Scale.NATURAL, u, x, total, dx, du, slope);
  }

  /** One allocation's conditional: its row of the shared templates. */
  private final class Row implements ConditionalDensity {
    private final int row;

    Row(int row) {
      this.row = row;
    }

    @Override
    public Unknown unknown() {
      return unknowns.get(row);
    }

    @Override
    public Scale scale() {
      return Scale.NATURAL;
    }

    @Override
    public double logDensity(double u, double[] state, double[] slope) {
      return AllocationRows.this.logDensity(row, u, state, slope);
    }

    @Override
    public double toNatural(double u) {
      return u;
    }

    @Override
    public double toSamplingScale(double v) {
      return v;
    }

    @Override
    public double lowerBound(double[] state) {
      return lower;
    }

    @Override
    public double upperBound(double[] state) {
      return upper;
    }

    @Override
    public boolean smooth() {
      return smooth;
    }

    @Override
    public int termCount() {
      return terms.length;
    }
  }
}
