package org.hullbound.model;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Statement;
import org.hullbound.model.family.Categorical;
import org.hullbound.model.family.Parametrisation;

/**
 * A statement with a distribution lowered once over its index set (docs/data.md, step 1): its
 * arguments and truncation bounds as formulas whose leaves read a row's index values, data
 * columns by index formula ({@code dose[patient]}, {@code effect[clinic_of[patient]]}) and
 * unknowns' slots, with lets inlined and sums expanded.
 *
 * <p>Why: a data row's term is made again whenever an analysis reads it ({@link TermTable}), and
 * lowering the statement's syntax for each row (names looked up, lets resolved, errors checked)
 * cost most of {@code check} on a file of millions of rows (issue 14). A row's term is now made
 * from this formula by the same folding ({@link Formulas#apply}) that lowering does, so it equals
 * the term lowering makes. A row this formula cannot make as lowering would (an index that reads
 * an unknown or a missing cell, an index outside its set) is answered with {@code null}, and its
 * term is lowered as before; a statement whose lowering this does not cover (a censored clause, a
 * vector argument, a name or set lowering would refuse) has no statement formula at all.
 */
final class StatementFormula {

  /** A formula of a row, given the row's index values; {@code null} where lowering must decide. */
  sealed interface RowFormula {
    Formula at(int[] row);

    /**
     * The row's value of this formula as folding makes it ({@link Formulas#apply}: the same
     * operations in the same order, so the same bits), with no formula made; each unknown it
     * reads goes to {@code check} ({@link RowCheck#read}), and then the value means nothing. A
     * row that {@link #at} would answer with {@code null} or lowering would refuse (an index not
     * whole or outside its set, an index that reads an unknown) sets {@link RowCheck#fault}, and
     * nothing is read after a fault, as lowering stops at the first.
     */
    double value(int[] row, RowCheck check);
  }

  /**
   * What a numeric pass over a row found ({@link RowFormula#value}): a fault that only lowering
   * can name, whether an unknown was read and which slots (with repeats). One per pass over a
   * statement's rows, reused from row to row, so that checking a row makes no object.
   */
  static final class RowCheck {
    boolean fault;
    boolean unknown;
    private int[] slots = new int[8];
    private int slotCount;
    /** The row's index values, filled by {@link #rowOf}. */
    private int[] row = new int[1];
    /** Per argument, its value where known, else {@code NaN}: as binding's {@code known}. */
    double[] known = new double[0];
    /** Per argument, whether it reads no unknown (a constant once folded). */
    boolean[] isKnown = new boolean[0];
    boolean allKnown;
    double lower;
    double upper;

    /** Unknown {@code slot} is read. */
    void read(int slot) {
      unknown = true;
      if (slotCount == slots.length) {
        slots = java.util.Arrays.copyOf(slots, 2 * slots.length);
      }
      slots[slotCount++] = slot;
    }

    /** The slots read since {@link #start}, with repeats, in {@code slots()[0 .. slotCount())}. */
    int[] slots() {
      return slots;
    }

    int slotCount() {
      return slotCount;
    }

    /** Starts a row of {@code arguments} arguments. */
    void start(int arguments) {
      fault = false;
      unknown = false;
      slotCount = 0;
      if (known.length != arguments) {
        known = new double[arguments];
        isKnown = new boolean[arguments];
      }
    }

    /** The index values of element {@code e} of {@code node}, in a buffer reused by the pass. */
    int[] rowOf(Node node, int e) {
      List<IndexSet> sets = node.indexSets;
      if (row.length != sets.size()) {
        row = new int[sets.size()];
      }
      if (row.length == 1) {
        // a statement per data row: its element is its row
        row[0] = sets.get(0).lower() + e;
        return row;
      }
      int offset = e;
      for (int i = row.length - 1; i >= 0; i--) {
        IndexSet set = sets.get(i);
        row[i] = set.lower() + offset % set.size();
        offset /= set.size();
      }
      return row;
    }

    /**
     * {@code f}'s value at {@code row} where it must be known (an index, a truncation bound):
     * an unknown read there is a fault, and {@link #unknown} is left as it was.
     */
    double knownValue(RowFormula f, int[] row) {
      boolean before = unknown;
      unknown = false;
      double v = f.value(row, this);
      fault |= unknown;
      unknown = before;
      return v;
    }
  }

  /** A formula that is the same for every row (a number). */
  private record Fixed(Formula formula) implements RowFormula {
    @Override
    public Formula at(int[] row) {
      return formula;
    }

    @Override
    public double value(int[] row, RowCheck check) {
      return ((Formula.Constant) formula).value();
    }
  }

  /** The value of the statement's index set at {@code position}, as lowering reads a set's name. */
  private record SetValue(int position) implements RowFormula {
    @Override
    public Formula at(int[] row) {
      return Formula.constant(row[position]);
    }

    @Override
    public double value(int[] row, RowCheck check) {
      return row[position];
    }
  }

  /** The whole value of an index formula, as a let's body reads the set it is indexed by. */
  private record IndexValue(RowFormula index) implements RowFormula {
    @Override
    public Formula at(int[] row) {
      Formula f = index.at(row);
      return f instanceof Formula.Constant c ? Formula.constant((int) c.value()) : null;
    }

    @Override
    public double value(int[] row, RowCheck check) {
      return (int) check.knownValue(index, row);
    }
  }

  /** {@code op(parts)}, folded as lowering folds it. */
  private record Apply(Op op, RowFormula[] parts) implements RowFormula {
    @Override
    public Formula at(int[] row) {
      List<Formula> made = new ArrayList<>(parts.length);
      for (RowFormula part : parts) {
        Formula f = part.at(row);
        if (f == null) {
          return null;
        }
        made.add(f);
      }
      return Formulas.apply(op, made);
    }

    @Override
    public double value(int[] row, RowCheck check) {
      if (op == Op.ADD) {
        // Formulas.apply sums a sum's known parts from 0, in order
        double sum = 0;
        for (RowFormula part : parts) {
          sum += part.value(row, check);
        }
        return sum;
      }
      double a = parts[0].value(row, check);
      return parts.length == 1 ? op.unary(a) : op.binary(a, parts[1].value(row, check));
    }
  }

  /** A sum, maximum or minimum over an index set, expanded as lowering expands it. */
  private record Reduction(Expression.Reduction reduction, RowFormula[] terms)
      implements RowFormula {
    @Override
    public Formula at(int[] row) {
      List<Formula> made = new ArrayList<>(terms.length);
      for (RowFormula term : terms) {
        Formula f = term.at(row);
        if (f == null) {
          return null;
        }
        made.add(f);
      }
      return switch (reduction) {
        case SUM -> Formulas.apply(Op.ADD, made);
        case MAX -> ModelLowering.pairwise(Op.MAX, made, 0, made.size());
        case MIN -> ModelLowering.pairwise(Op.MIN, made, 0, made.size());
      };
    }

    @Override
    public double value(int[] row, RowCheck check) {
      return switch (reduction) {
        case SUM -> {
          double sum = 0;
          for (RowFormula term : terms) {
            sum += term.value(row, check);
          }
          yield sum;
        }
        case MAX -> pairwise(Op.MAX, row, check, 0, terms.length);
        case MIN -> pairwise(Op.MIN, row, check, 0, terms.length);
      };
    }

    /** {@link ModelLowering#pairwise}'s balanced tree, in numbers. */
    private double pairwise(Op op, int[] row, RowCheck check, int from, int to) {
      if (to - from == 1) {
        return terms[from].value(row, check);
      }
      int middle = (from + to) >>> 1;
      double a = pairwise(op, row, check, from, middle);
      return op.binary(a, pairwise(op, row, check, middle, to));
    }
  }

  /**
   * Element {@code indexes} of a data, param or let name: a data value a constant of its cell, a
   * missing cell or a param its slot, a let its cached formula or its body inlined ({@code body}),
   * as {@link ModelLowering} decides for that let.
   */
  private record Element(
      Node node, RowFormula[] indexes, Formula.Cells cells, RowFormula body, ModelLowering lowering)
      implements RowFormula {
    @Override
    public Formula at(int[] row) {
      int[] index = new int[indexes.length];
      for (int i = 0; i < index.length; i++) {
        Formula f = indexes[i].at(row);
        if (!(f instanceof Formula.Constant c)) {
          return null;
        }
        double v = c.value();
        IndexSet expected = node.indexSets.get(i);
        if (v != Math.rint(v) || !expected.contains(v)) {
          return null;
        }
        index[i] = (int) v;
      }
      int offset = node.offset(index);
      return switch (node.kind) {
        case DATA -> {
          if (node.missing[offset]) {
            yield node.slots == null ? null : lowering.slot(node.slots[offset]);
          }
          yield new Formula.Constant(node.values[offset], cells, offset);
        }
        case PARAM -> lowering.slot(node.slots[offset]);
        case LET -> body != null ? body.at(row) : lowering.letElement(node, index);
      };
    }

    @Override
    public double value(int[] row, RowCheck check) {
      if (check.fault) {
        return Double.NaN;
      }
      int offset = 0;
      for (int i = 0; i < indexes.length; i++) {
        double v = check.knownValue(indexes[i], row);
        IndexSet expected = node.indexSets.get(i);
        if (check.fault || v != Math.rint(v) || !expected.contains(v)) {
          check.fault = true;
          return Double.NaN;
        }
        offset = offset * expected.size() + ((int) v - expected.lower());
      }
      switch (node.kind) {
        case DATA:
          if (!node.missing[offset]) {
            return node.values[offset];
          }
          if (node.slots == null || node.slots[offset] < 0) {
            check.fault = true;
          } else {
            check.read(node.slots[offset]);
          }
          return Double.NaN;
        case PARAM:
          check.read(node.slots[offset]);
          return Double.NaN;
        default:
          if (body != null) {
            return body.value(row, check);
          }
          // a let of few elements, cached by lowering: its formula, made once for all rows
          int[] index = new int[indexes.length];
          for (int i = 0; i < index.length; i++) {
            index[i] = (int) indexes[i].value(row, check);
          }
          Formula f = lowering.letElement(node, index);
          readSlots(f, check);
          return f instanceof Formula.Constant c ? c.value() : Double.NaN;
      }
    }

    /**
     * The slot of this param element at {@code row}, in numbers, or -1 where its indexes have a
     * fault there ({@link #at} would answer {@code null}).
     */
    int slotAt(int[] row, RowCheck check) {
      check.fault = false;
      int offset = 0;
      for (int i = 0; i < indexes.length; i++) {
        double v = check.knownValue(indexes[i], row);
        IndexSet expected = node.indexSets.get(i);
        if (check.fault || v != Math.rint(v) || !expected.contains(v)) {
          return -1;
        }
        offset = offset * expected.size() + ((int) v - expected.lower());
      }
      return node.slots[offset];
    }

    private static void readSlots(Formula f, RowCheck check) {
      if (f instanceof Formula.Slot slot) {
        check.read(slot.index());
      } else if (f instanceof Formula.Operation operation) {
        for (Formula part : operation.parts()) {
          readSlots(part, check);
        }
      }
    }
  }

  private final Node node;
  private final Parametrisation family;
  private final RowFormula[] arguments;
  private final RowFormula lower;
  private final RowFormula upper;
  private final Formula.Cells cells;
  private final ModelLowering lowering;
  /** Whether every row's term is made here ({@link #term} never answers {@code null}). */
  private final boolean total;
  /** The operators of every row's formulas, or {@code null} where a let's formula hides some. */
  private final java.util.Set<Op> ops;
  /**
   * Per argument, its params' elements (each a param's slot by index formula), when every
   * argument reads some param and is affine in each of them whatever the row ({@link
   * #affineInEveryUnknown}); {@code null} otherwise.
   */
  private final Element[][] paramLeaves;
  /**
   * Per argument and param element, +1 or -1 where the element enters the argument through sums,
   * differences and negations only (a coefficient of exactly +1 or -1 in every row), 0 where a
   * data factor or divisor is on its way.
   */
  private final int[][] paramSigns;

  private StatementFormula(Node node, RowFormula[] arguments, RowFormula lower, RowFormula upper,
      Formula.Cells cells, ModelLowering lowering, boolean total, java.util.Set<Op> ops) {
    this.node = node;
    this.lowering = lowering;
    this.total = total;
    this.ops = ops;
    int[][] signs = new int[arguments.length][];
    this.paramLeaves = total && ops != null ? paramLeaves(arguments, signs) : null;
    this.paramSigns = signs;
    this.family = node.parametrisation;
    this.arguments = arguments;
    this.lower = lower;
    this.upper = upper;
    this.cells = cells;
  }

  /** Raised inside {@link #of} where lowering would refuse or do what this does not cover. */
  private static final class NotCovered extends RuntimeException {
    NotCovered() {
      super(null, null, false, false);
    }
  }

  /**
   * The statement formula of {@code node} (a node with a distribution, bound without error), or
   * {@code null} when its rows' terms must be lowered one by one.
   */
  static StatementFormula of(
      Node node, BindingScope scope, DataBinding data, ModelLowering lowering, boolean censored) {
    if (censored || Categorical.takesVector(node.parametrisation)) {
      return null;
    }
    Map<String, RowFormula> env = new HashMap<>();
    for (int i = 0; i < node.indexSets.size(); i++) {
      env.put(node.indexSets.get(i).name(), new SetValue(i));
    }
    Lowering rows = new Lowering(scope, data, lowering);
    try {
      RowFormula[] arguments = new RowFormula[node.argumentExpressions.length];
      for (int k = 0; k < arguments.length; k++) {
        arguments[k] = rows.lower(node.argumentExpressions[k], env);
      }
      org.hullbound.lang.Truncation within = node.distribution.truncation();
      RowFormula lower = within == null ? null : rows.lower(within.lower(), env);
      RowFormula upper = within == null ? null : rows.lower(within.upper(), env);
      return new StatementFormula(node, arguments, lower, upper,
          node.kind == Node.Kind.DATA ? data.cells(node) : null, lowering, rows.total,
          rows.opaque ? null : java.util.Set.copyOf(rows.ops));
    } catch (NotCovered notCovered) {
      return null;
    }
  }

  /**
   * Whether no row's term of this statement can have a part that is not smooth (abs, min, max),
   * an unknown index's indicator, nor a family whose support or kink moves with an argument
   * (laplace, between its first two arguments): what {@code UpdateAnalysis.smooth} and the
   * unknown-index questions of {@code BoundModel} look for, answered once for all rows. Folding
   * only removes operators, so the rows' formulas have no operator that this one lacks.
   */
  boolean smoothForEveryRow() {
    if (!total || ops == null || family.family().name().equals("laplace")
        || family.support() == org.hullbound.model.family.SupportKind.BETWEEN_FIRST_TWO_ARGUMENTS) {
      return false;
    }
    for (Op op : ops) {
      if (!op.smooth() || op == Op.EQUAL) {
        return false;
      }
    }
    return true;
  }

  /**
   * Whether, in every row, each argument reads some param and is affine in every unknown it
   * reads ({@link Formulas#affine}), and no unknown but params is read: then an argument is never
   * known and the unknowns it reads are its params' elements at that row. The arguments are built
   * of params' elements and data-only parts by sums, differences, negation, products with a
   * data-only factor and quotients by a data-only divisor; folding a row's formula keeps that
   * form, as it only turns data-only parts into constants.
   */
  boolean affineInEveryUnknown() {
    return paramLeaves != null;
  }

  /** The names of the statement's elements, every row's term's ({@link Term#names}). */
  ElementNames names() {
    return node.names();
  }

  /** The owner of row {@code e}'s term ({@link Term#owner}): its slot if missing, else -1. */
  int owner(int e) {
    return node.slots[e];
  }

  /** Whether the statement is truncated ({@code within}), and so every row's term. */
  boolean truncated() {
    return lower != null;
  }

  /** The statement's family, every row's ({@link #noBoundedArgument}). */
  Parametrisation family() {
    return family;
  }

  /**
   * The arguments of row {@code e}'s term that read slot {@code slot}, as bits ({@code 1 << k});
   * for a statement {@link #affineInEveryUnknown} only. Worked out from the row's indexes alone,
   * with no term made.
   */
  long argumentsReading(int e, int slot) {
    return argumentsReading(e, read -> read == slot);
  }

  /** {@link #movingArgument}: no argument reads such a slot. */
  static final int NO_ARGUMENT = -1;
  /** {@link #movingArgument}: the row's term must be read (two arguments, or truncated). */
  static final int READ_THE_TERM = -2;

  /**
   * The one argument of row {@code e}'s term that reads a slot {@code which} accepts, where the
   * statement alone then answers for the row; {@link #NO_ARGUMENT} or {@link #READ_THE_TERM}
   * otherwise. For a statement {@link #affineInEveryUnknown} only.
   */
  int movingArgument(int e, java.util.function.IntPredicate which) {
    long reading = argumentsReading(e, which);
    if (reading == 0) {
      return NO_ARGUMENT;
    }
    return Long.bitCount(reading) == 1 && !truncated() ? Long.numberOfTrailingZeros(reading)
        : READ_THE_TERM;
  }

  /**
   * The one argument through which any row of this statement can read a slot {@code which}
   * accepts, worked out once from the params its arguments' leaves name (every element of each):
   * a row that reads such a slot through its arguments then reads it there alone, and {@link
   * #movingArgument} is that argument for it, with no row looked at. {@link #READ_THE_TERM} where
   * the rows must be looked at: several arguments or none may read one, the statement is
   * truncated, or a param has too many elements to look through. For a statement {@link
   * #affineInEveryUnknown} only.
   */
  int onlyArgumentReading(java.util.function.IntPredicate which) {
    if (truncated()) {
      return READ_THE_TERM;
    }
    int found = READ_THE_TERM;
    for (int k = 0; k < paramLeaves.length; k++) {
      boolean may = false;
      for (Element leaf : paramLeaves[k]) {
        Node param = leaf.node();
        if (param.size > ModelLowering.LARGEST_HELD_LET) {
          return READ_THE_TERM;
        }
        for (int i = 0; i < param.size && !may; i++) {
          may = which.test(param.slots[i]);
        }
      }
      if (may) {
        if (found != READ_THE_TERM) {
          return READ_THE_TERM;
        }
        found = k;
      }
    }
    return found;
  }

  /** Whether no row's value is an unknown: data with no missing cell, each row observed. */
  boolean everyRowObserved() {
    Boolean observed = everyRowObserved;
    if (observed == null) {
      observed = node.kind == Node.Kind.DATA && !Lowering.anyMissing(node);
      everyRowObserved = observed;
    }
    return observed;
  }

  /** {@link #everyRowObserved}, once worked out (a look at every row's missing flag). */
  private Boolean everyRowObserved;

  /**
   * Answers per (statement, argument), each worked out once in a pass over an unknown's blanket
   * or a line's moved terms: a piece of a proof, or the verdict that defeats it.
   */
  static final class ArgumentAnswers {
    private final Map<StatementFormula, Object[]> answers = new HashMap<>();
    /** The last statement asked and its answers: a pass asks for one statement's rows in a run. */
    private StatementFormula last;
    private Object[] lastAnswers;

    /** The answer for argument {@code k} of {@code statement}, from {@code answer} once. */
    Object of(StatementFormula statement, int k,
        java.util.function.BiFunction<Parametrisation, Integer, Object> answer) {
      if (statement != last) {
        last = statement;
        lastAnswers = answers.computeIfAbsent(statement,
            st -> new Object[st.family().argumentNames().size()]);
      }
      Object[] byArgument = lastAnswers;
      if (byArgument[k] == null) {
        byArgument[k] = answer.apply(statement.family(), k);
      }
      return byArgument[k];
    }
  }

  /**
   * The arguments of row {@code e}'s term that read a slot {@code which} accepts, as bits. Read
   * from the row's index values in numbers ({@link Element#slotAt}): a pass over millions of rows
   * makes no object per row.
   */
  long argumentsReading(int e, java.util.function.IntPredicate which) {
    RowCheck check = SCRATCH.get();
    int[] row = check.rowOf(node, e);
    long bits = 0;
    for (int k = 0; k < paramLeaves.length; k++) {
      for (Element leaf : paramLeaves[k]) {
        int read = leaf.slotAt(row, check);
        if (read >= 0 && which.test(read)) {
          bits |= 1L << k;
          break;
        }
      }
    }
    return bits;
  }

  /** Each thread's buffers for the passes of the analyses over rows ({@link #argumentsReading}). */
  private static final ThreadLocal<RowCheck> SCRATCH = ThreadLocal.withInitial(RowCheck::new);

  /**
   * The slots that argument {@code k} of row {@code e}'s term reads, with repeats, for a
   * statement {@link #affineInEveryUnknown} only (its params' elements are all it reads).
   */
  int[] argumentSlots(int e, int k) {
    return argumentSlots(e, k, new int[paramLeaves[k].length]);
  }

  /**
   * {@link #argumentSlots(int, int)} into {@code slots} when it is long enough (a pass over rows
   * then makes no array per row), else into a new array; the slots fill its first {@link
   * #argumentSlotCount} entries.
   */
  int[] argumentSlots(int e, int k, int[] slots) {
    int count = paramLeaves[k].length;
    if (slots.length < count) {
      slots = new int[count];
    }
    RowCheck check = SCRATCH.get();
    int[] row = check.rowOf(node, e);
    for (int i = 0; i < count; i++) {
      slots[i] = paramLeaves[k][i].slotAt(row, check);
    }
    return slots;
  }

  /** How many slots argument {@code k} of every row reads, with repeats ({@link #argumentSlots}). */
  int argumentSlotCount(int k) {
    return paramLeaves[k].length;
  }

  /** Each argument's param elements if every argument is affine in them (see above), or null. */
  private static Element[][] paramLeaves(RowFormula[] arguments, int[][] signs) {
    if (arguments.length > 63) {
      return null;
    }
    Element[][] leaves = new Element[arguments.length][];
    for (int k = 0; k < arguments.length; k++) {
      List<Element> found = new ArrayList<>();
      List<Integer> foundSigns = new ArrayList<>();
      if (!affine(arguments[k], 1, found, foundSigns) || found.isEmpty()) {
        return null;
      }
      leaves[k] = found.toArray(new Element[0]);
      signs[k] = foundSigns.stream().mapToInt(Integer::intValue).toArray();
    }
    return leaves;
  }

  /**
   * Whether {@code f} is affine in every param it reads whatever the row, reading no other
   * unknown; gathers its params' elements into {@code params} with their {@code signs} (see
   * {@link #paramSigns}; {@code sign} is the way so far).
   */
  private static boolean affine(RowFormula f, int sign, List<Element> params, List<Integer> signs) {
    if (f instanceof Element e) {
      switch (e.node().kind) {
        case PARAM:
          params.add(e);
          signs.add(sign);
          return true;
        case DATA:
          return !Lowering.anyMissing(e.node());
        default:
          return e.body() != null && affine(e.body(), sign, params, signs);
      }
    }
    if (f instanceof Apply a) {
      RowFormula[] p = a.parts();
      switch (a.op()) {
        case ADD:
          for (RowFormula part : p) {
            if (!affine(part, sign, params, signs)) {
              return false;
            }
          }
          return true;
        case SUBTRACT:
          return affine(p[0], sign, params, signs) && affine(p[1], -sign, params, signs);
        case NEGATE:
          return affine(p[0], -sign, params, signs);
        case MULTIPLY:
          return paramFree(p[0]) ? affine(p[1], 0, params, signs)
              : paramFree(p[1]) && affine(p[0], 0, params, signs);
        case DIVIDE:
          return paramFree(p[1]) && affine(p[0], 0, params, signs);
        default:
          return paramFree(f);
      }
    }
    if (f instanceof Reduction r) {
      if (r.reduction() != Expression.Reduction.SUM) {
        return paramFree(f);
      }
      for (RowFormula term : r.terms()) {
        if (!affine(term, sign, params, signs)) {
          return false;
        }
      }
      return true;
    }
    return true; // a number or an index value
  }

  /**
   * Whether row {@code e}'s term is unchanged when each unknown {@code j} moves by {@code
   * weights[j] * d} (weights of +1 or -1, 0 for unknowns that stay): 1 when every argument that
   * reads a moved unknown has a slope of exactly 0 in {@code d}, 0 when one has another slope, -1
   * when this cannot tell (a moved unknown with a data factor on its way; the row's term must be
   * read). For a statement {@link #affineInEveryUnknown} only. With coefficients of +1 or -1 and
   * weights of +1 or -1, the slope {@link Formulas#affineParts} folds is a small whole number,
   * exact whatever the order of its sum.
   */
  int unchangedWhenShifted(int e, int[] weights) {
    RowCheck check = SCRATCH.get();
    int[] row = check.rowOf(node, e);
    boolean changed = false;
    for (int k = 0; k < paramLeaves.length; k++) {
      int slope = 0;
      for (int i = 0; i < paramLeaves[k].length; i++) {
        int slot = paramLeaves[k][i].slotAt(row, check);
        int weight = slot >= 0 && slot < weights.length ? weights[slot] : 0;
        if (weight == 0) {
          continue;
        }
        if (paramSigns[k][i] == 0) {
          return -1;
        }
        slope += paramSigns[k][i] * weight;
      }
      changed |= slope != 0;
    }
    return changed ? 0 : 1;
  }

  /** Whether {@code f} reads no unknown at any row: data without missing cells and numbers. */
  private static boolean paramFree(RowFormula f) {
    return Lowering.dataOnly(f);
  }

  /** Whether every row's term has no unknown index (no indicator operator): see above. */
  boolean noUnknownIndex() {
    return total && ops != null && !ops.contains(Op.EQUAL);
  }

  /**
   * Whether no argument of this statement's family has a bounded range: then no row's term cuts
   * an unknown's support ({@link ArgumentBounds}). Every row's term has the statement's family
   * (censored rows and vector arguments have no statement formula).
   */
  boolean noBoundedArgument() {
    for (int k = 0; k < arguments.length; k++) {
      if (family.argumentRange(k).bounded()) {
        return false;
      }
    }
    return true;
  }

  /**
   * Whether binding may check this statement's rows from it ({@link #evaluateRow}) instead of
   * lowering each: every row's term is made here, and no {@code check} is being bound.
   */
  boolean checksRows() {
    return total && !lowering.replicating();
  }

  /**
   * Row {@code e}'s arguments and truncation bounds in numbers, as its term would hold them once
   * folded ({@link RowFormula#value}), into {@code check}: {@link RowCheck#known} and {@link
   * RowCheck#isKnown} per argument, {@link RowCheck#allKnown}, the bounds, and the slots the
   * arguments read. {@code false} at a fault that lowering the row would name (an index, an
   * unknown bound); the row must then be lowered for its message.
   */
  boolean evaluateRow(int e, RowCheck check) {
    check.start(arguments.length);
    int[] row = check.rowOf(node, e);
    boolean allKnown = true;
    for (int k = 0; k < arguments.length; k++) {
      check.unknown = false;
      double v = arguments[k].value(row, check);
      if (check.fault) {
        return false;
      }
      boolean known = !check.unknown;
      check.isKnown[k] = known;
      check.known[k] = known ? v : Double.NaN;
      allKnown &= known;
    }
    check.allKnown = allKnown;
    if (lower != null) {
      check.lower = check.knownValue(lower, row);
      check.upper = check.knownValue(upper, row);
    }
    return !check.fault;
  }

  /**
   * The body of let {@code node} (of more than {@link ModelLowering#LARGEST_HELD_LET} elements)
   * lowered once over its index set, so that binding checks each element by numbers ({@link
   * #letRowFine}) rather than lowering it; {@code null} where its elements must be lowered one
   * by one (an index that may read an unknown, a form this does not cover).
   */
  static RowFormula letRows(
      Node node, BindingScope scope, DataBinding data, ModelLowering lowering) {
    Map<String, RowFormula> env = new HashMap<>();
    for (int i = 0; i < node.indexSets.size(); i++) {
      env.put(node.indexSets.get(i).name(), new SetValue(i));
    }
    Lowering rows = new Lowering(scope, data, lowering);
    try {
      RowFormula body = rows.lower(node.letValue, env);
      return rows.total ? body : null;
    } catch (NotCovered notCovered) {
      return null;
    }
  }

  /**
   * Whether element {@code e} of let {@code node}, whose body is {@code body} ({@link #letRows}),
   * resolves without a fault: its indexes whole and in their sets. Where not, lowering it names
   * the fault.
   */
  static boolean letRowFine(Node node, RowFormula body, int e, RowCheck check) {
    check.start(0);
    body.value(check.rowOf(node, e), check);
    return !check.fault;
  }

  /**
   * The term of row {@code e}, equal to the one lowering makes, or {@code null} when that row
   * must be lowered (see the class comment).
   */
  Term term(int e) {
    if (lowering.replicating()) {
      return null;
    }
    int[] row = node.index(e);
    List<Formula> args = new ArrayList<>(arguments.length);
    for (RowFormula a : arguments) {
      Formula f = a.at(row);
      if (f == null) {
        return null;
      }
      args.add(f);
    }
    Term.Within within = null;
    if (lower != null) {
      Formula l = lower.at(row);
      Formula u = upper.at(row);
      if (!(l instanceof Formula.Constant lc) || !(u instanceof Formula.Constant uc)) {
        return null;
      }
      within = new Term.Within(lc.value(), uc.value());
    }
    int slot = node.slots[e];
    Formula value = slot >= 0 ? lowering.slot(slot) : Formula.constant(node.values[e]);
    return new Term(node.names(), e, slot >= 0 ? null : cells, family, value, args, within, slot,
        node.position());
  }

  /** Lowers an expression over a statement's rows, as {@link ModelLowering} lowers it for one. */
  private static final class Lowering {
    private final BindingScope scope;
    private final DataBinding data;
    private final ModelLowering lowering;
    /** The operators applied anywhere (lets inlined), for the structural answers. */
    private final java.util.EnumSet<Op> ops = java.util.EnumSet.noneOf(Op.class);
    /** Whether every index reads data only, so that every row's term is made here. */
    private boolean total = true;
    /** Whether a part is a let's formula held by lowering, whose operators are not seen here. */
    private boolean opaque;

    Lowering(BindingScope scope, DataBinding data, ModelLowering lowering) {
      this.scope = scope;
      this.data = data;
      this.lowering = lowering;
    }

    RowFormula lower(Expression e, Map<String, RowFormula> env) {
      if (e instanceof Expression.Number number) {
        return new Fixed(Formula.constant(number.value()));
      }
      if (e instanceof Expression.Negation negation) {
        ops.add(Op.NEGATE);
        return new Apply(Op.NEGATE, new RowFormula[] {lower(negation.operand(), env)});
      }
      if (e instanceof Expression.Binary binary) {
        Op op = ExpressionLowering.operator(binary);
        ops.add(op);
        return new Apply(op, new RowFormula[] {lower(binary.left(), env), lower(binary.right(), env)});
      }
      if (e instanceof Expression.Call call) {
        Op op = Op.function(call.function().text());
        if (op == null || call.arguments().size() != op.arity()) {
          throw new NotCovered();
        }
        ops.add(op);
        RowFormula[] parts = new RowFormula[call.arguments().size()];
        for (int k = 0; k < parts.length; k++) {
          parts[k] = lower(call.arguments().get(k), env);
        }
        return new Apply(op, parts);
      }
      if (e instanceof Expression.Sum sum) {
        return sum(sum, env);
      }
      return name((Expression.Name) e, env);
    }

    private RowFormula sum(Expression.Sum sum, Map<String, RowFormula> env) {
      String setName = sum.indexSet().text();
      IndexSet set = scope.sets.get(setName);
      if (set == null || env.containsKey(setName)
          || set.size() == 0 && sum.reduction() != Expression.Reduction.SUM) {
        throw new NotCovered();
      }
      ops.add(switch (sum.reduction()) {
        case SUM -> Op.ADD;
        case MAX -> Op.MAX;
        case MIN -> Op.MIN;
      });
      RowFormula[] terms = new RowFormula[set.size()];
      Map<String, RowFormula> inner = new HashMap<>(env);
      for (int v = set.lower(); v <= set.upper(); v++) {
        inner.put(setName, new Fixed(Formula.constant(v)));
        terms[v - set.lower()] = lower(sum.body(), inner);
      }
      return new Reduction(sum.reduction(), terms);
    }

    private RowFormula name(Expression.Name reference, Map<String, RowFormula> env) {
      String name = reference.name().text();
      if (scope.indexStatements.containsKey(name)) {
        RowFormula value = env.get(name);
        if (!reference.indexes().isEmpty() || value == null) {
          throw new NotCovered();
        }
        return value;
      }
      Node node = scope.nodes.get(name);
      if (node == null || node.indexSets == null
          || reference.indexes().size() != node.indexSets.size()) {
        throw new NotCovered();
      }
      RowFormula[] indexes = new RowFormula[node.indexSets.size()];
      for (int i = 0; i < indexes.length; i++) {
        Expression indexExpression = reference.indexes().get(i);
        if (indexExpression instanceof Expression.Name bare
            && bare.indexes().isEmpty()
            && scope.indexStatements.containsKey(bare.name().text())
            && !bare.name().text().equals(node.indexSets.get(i).name())) {
          throw new NotCovered();
        }
        indexes[i] = lower(indexExpression, env);
        total &= dataOnly(indexes[i]);
      }
      RowFormula body = null;
      // a let of a few elements is cached by lowering, whose formulas a row's term then shares
      if (node.kind == Node.Kind.LET && node.size > ModelLowering.LARGEST_HELD_LET) {
        Map<String, RowFormula> letEnv = new HashMap<>();
        for (int i = 0; i < indexes.length; i++) {
          letEnv.put(node.indexSets.get(i).name(), new IndexValue(indexes[i]));
        }
        body = lower(node.letValue, letEnv);
      }
      opaque |= node.kind == Node.Kind.LET && body == null;
      return new Element(node, indexes,
          node.kind == Node.Kind.DATA ? data.cells(node) : null, body, lowering);
    }

    /** Whether {@code f} reads data with no missing cell only: a known value at every row. */
    static boolean dataOnly(RowFormula f) {
      if (f instanceof IndexValue value) {
        return dataOnly(value.index());
      }
      if (f instanceof Apply apply) {
        return java.util.Arrays.stream(apply.parts()).allMatch(Lowering::dataOnly);
      }
      if (f instanceof Reduction r) {
        return java.util.Arrays.stream(r.terms()).allMatch(Lowering::dataOnly);
      }
      if (f instanceof Element e) {
        return e.node().kind == Node.Kind.DATA && !anyMissing(e.node())
            && java.util.Arrays.stream(e.indexes()).allMatch(Lowering::dataOnly);
      }
      return true; // a number or the statement's own index value
    }

    static boolean anyMissing(Node node) {
      for (boolean m : node.missing) {
        if (m) {
          return true;
        }
      }
      return false;
    }
  }
}
