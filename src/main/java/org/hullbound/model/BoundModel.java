package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.atomic.AtomicReferenceArray;
import java.util.function.Predicate;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.lang.SourcePosition;

/**
 * A model bound to its data: index sets sized, data read and checked, and a graph of data,
 * param and let nodes reduced to scalar unknowns, each with its compiled full conditional and
 * the update chosen for it.
 *
 * <p>The entry point between a parsed {@code .hbm} file and the Gibbs driver:
 *
 * <pre>{@code
 * BoundModel model = BoundModel.bind(modelFile, List.of(CsvData.read(path)));
 * double[] state = model.initialState();
 * for (Unknown unknown : model.unknowns()) {
 *   ConditionalDensity conditional = model.conditional(unknown.index());
 *   Update update = model.update(unknown.index());     // conjugate, adaptive rejection, fallback
 *   double u = conditional.toSamplingScale(state[unknown.index()]);
 *   double logp = conditional.logDensity(u, state, slope);  // value and d/du in one call
 * }
 * }</pre>
 *
 * <p>Each conditional sums only its unknown's Markov blanket (its own term and the terms that
 * read it, found element by element through let chains and nested indexing) and is compiled on
 * first use, then cached; instances are safe to share between chains.
 */
public final class BoundModel {
  private final String name;
  private final String fileName;
  private final List<IndexSet> indexSets;
  private final List<Term> terms;
  private final List<Unknown> unknowns;
  private final int[] ownTerm;
  private final int[][] dependents;
  private final Update[] updates;
  /** Each unknown's update on its own, before blocks replace some of them. */
  private final Update[] singleUpdates;
  private final Formula[] lowerBounds;
  private final Formula[] upperBounds;
  /** Where the dependent terms' arguments with a bounded range cut each unknown's support. */
  private final ArgumentBounds[] cuts;
  private final boolean[] smooth;
  private final double[] initialState;
  private final List<DataSummary> data;
  private final Map<String, Integer> nodeCounts;
  private final DerivedQuantities derived;
  private final AtomicReferenceArray<ConditionalDensity> conditionals;
  /** Per name of allocations: its {@link AllocationRows}, or {@code FALSE} where they differ. */
  private final Map<String, Object> allocationRows =
      new java.util.concurrent.ConcurrentHashMap<>();
  private final List<Binder.CheckFormula> checks;
  /** Value and argument evaluators of every term, compiled on the first joint evaluation. */
  private volatile Evaluator[][] joint;
  /** The moves along lines ({@link MovePatterns}), found on the first call of {@link #moves}. */
  private volatile List<Update> moves;

  private BoundModel(Binder.Result result) {
    this.name = result.name();
    this.fileName = result.fileName();
    this.indexSets = List.copyOf(result.indexSets());
    // Not copied: the terms of data rows are made when asked (TermTable), not held.
    this.terms = result.terms();
    this.ownTerm = result.ownTerm();
    this.data = List.copyOf(result.data());
    this.nodeCounts = Map.copyOf(result.nodeCounts());
    this.checks = List.copyOf(result.checks());
    this.derived = result.derived();
    int n = result.labels().size();
    this.dependents = result.dependents();
    this.updates = new Update[n];
    this.singleUpdates = new Update[n];
    this.lowerBounds = new Formula[n];
    this.upperBounds = new Formula[n];
    this.cuts = new ArgumentBounds[n];
    this.smooth = new boolean[n];
    List<Unknown> list = new ArrayList<>();
    for (int s = 0; s < n; s++) {
      Term own = terms.get(ownTerm[s]);
      List<Term> children = dependentTerms(s);
      boolean discrete = own.family().discrete();
      boolean imputed = result.imputed().get(s);
      Formula[] support = support(own);
      // Statements that answer a question for all their rows at once leave their rows out of
      // that question's pass: each row read would be a term made again (docs/data.md).
      cuts[s] = ArgumentBounds.of(s, own,
          unansweredTerms(s, StatementFormula::noBoundedArgument),
          support[0] instanceof Formula.Constant c ? c.value() : Double.NaN,
          support[1] instanceof Formula.Constant c ? c.value() : Double.NaN);
      boolean smoothTerms =
          UpdateAnalysis.smooth(s, own, unansweredTerms(s, StatementFormula::smoothForEveryRow));
      UpdateAnalysis.Choice choice =
          UpdateAnalysis.choose(s, own, children, discrete, imputed, cuts[s], smoothTerms);
      updates[s] = choice.update();
      singleUpdates[s] = choice.update();
      smooth[s] = smoothTerms && !discrete;
      lowerBounds[s] = support[0];
      upperBounds[s] = support[1];
      list.add(
          new Unknown(
              s,
              result.labels().get(s),
              result.nodeOfSlot().get(s),
              choice.scale(),
              support[0] instanceof Formula.Constant c ? c.value() : Double.NaN,
              support[1] instanceof Formula.Constant c ? c.value() : Double.NaN,
              imputed,
              discrete));
    }
    this.unknowns = List.copyOf(list);
    int[][] blankets = new int[n][];
    boolean[] imputedSlots = new boolean[n];
    for (int s = 0; s < n; s++) {
      blankets[s] = new int[dependents[s].length + 1];
      blankets[s][0] = ownTerm[s];
      System.arraycopy(dependents[s], 0, blankets[s], 1, dependents[s].length);
      imputedSlots[s] = result.imputed().get(s);
    }
    // A block is preferred over its members' one-at-a-time (even conjugate) updates: it mixes
    // better when the members are correlated a posteriori.
    for (int[] members : LinearNormalBlocks.find(terms, blankets, imputedSlots)) {
      Update block = LinearNormalBlocks.update(members, terms, blankets);
      for (int s : members) {
        updates[s] = block;
      }
    }
    this.conditionals = new AtomicReferenceArray<>(n);
    this.initialState = initialState();
  }

  /**
   * Binds {@code model} to the data tables read from its data files.
   *
   * @throws ModelException for any semantic fault of the model or the data, positioned
   */
  public static BoundModel bind(ModelFile model, List<DataTable> data) {
    return bind(model, data, EmptyCells.IMPUTED);
  }

  /**
   * Binds {@code model} to its data tables, with {@code emptyCells} saying whether an empty cell
   * of a modelled column is a missing observation or an error.
   *
   * @throws ModelException for any semantic fault of the model or the data, positioned
   */
  public static BoundModel bind(ModelFile model, List<DataTable> data, EmptyCells emptyCells) {
    if (emptyCells == null) {
      throw new IllegalArgumentException("emptyCells must not be null");
    }
    if (model == null) {
      throw new IllegalArgumentException("model must not be null");
    }
    if (data == null) {
      throw new IllegalArgumentException("data must not be null (use an empty list)");
    }
    Binder.Result bound = Binder.bind(model, data, emptyCells);
    try {
      return new BoundModel(bound);
    } catch (ModelException e) {
      // the update analysis refuses a discrete param at its declaration: quote that line
      if (e.position().file().equals(model.source().fileName())) {
        throw ModelException.at(model.source(), e.position(), e.problem(), e.hint());
      }
      throw e;
    }
  }

  /**
   * Which header cells of a data file name a column {@code model} reads: those whose name (before
   * any {@code [..]}) is data declared without inline values. A reader keeps only these; every
   * other column is a fault that binding reports from the header alone, so nothing is lost.
   */
  public static Predicate<String> readsColumn(ModelFile model) {
    return Binder.readsColumn(model);
  }

  /** The model's name, from its {@code model} statement or its file name. */
  public String name() {
    return name;
  }

  /**
   * The unknown whose label is nearest to {@code wrong} ({@link NameSuggestion}), for a "did you
   * mean" hint where a name of an unknown was mistyped (as in {@code --init}); empty when none is
   * close.
   */
  public java.util.Optional<String> nearestUnknown(String wrong) {
    return NameSuggestion.nearest(wrong, unknowns().stream().map(Unknown::label).toList());
  }

  /**
   * Returns normally when the model has at least one unknown, the condition for sampling it.
   *
   * @throws ModelException naming the model file when it has none
   */
  public void requireUnknowns() {
    if (unknowns.isEmpty()) {
      throw new ModelException(
          new SourcePosition(fileName, 1, 1), null,
          "model " + name + " has no unknowns (no param and no missing data), so there is"
              + " nothing to draw",
          "declare a param with a prior, or mark unobserved data NA");
    }
  }

  /**
   * Every scalar unknown, in state order: the params' elements in statement order, then the
   * missing observations in statement order.
   */
  public List<Unknown> unknowns() {
    return unknowns;
  }

  /** The unknown labelled {@code label}, such as {@code effect[3]}. */
  public Unknown unknown(String label) {
    for (Unknown u : unknowns) {
      if (u.label().equals(label)) {
        return u;
      }
    }
    throw new IllegalArgumentException("label must name an unknown of " + name + ", got " + label);
  }

  /** The index sets with their bounds, as declared or sized from the data. */
  public List<IndexSet> indexSets() {
    return indexSets;
  }

  /** What was read from each data source. */
  public List<DataSummary> data() {
    return data;
  }

  /** How many data, param and let nodes the model declares. */
  public Map<String, Integer> nodeCounts() {
    return nodeCounts;
  }

  /** The {@code let} quantities kept with the draws, and why each let is kept or not. */
  public DerivedQuantities derived() {
    return derived;
  }

  /** How many element-level terms (priors and likelihoods) the joint density has. */
  public int termCount() {
    return terms.size();
  }

  /**
   * A valid starting state (natural scale): inside every unknown's support, at the location
   * argument of its prior when that is known, otherwise at 0, 1 or 1/2 for real, positive and
   * unit-interval unknowns. A fresh copy on every call.
   */
  public double[] initialState() {
    if (initialState != null) {
      return initialState.clone();
    }
    double[] state = new double[unknowns.size()];
    for (Unknown u : unknowns) {
      state[u.index()] = startingValue(u, terms.get(ownTerm[u.index()]));
    }
    for (Unknown u : unknowns) {
      if (!(lowerBounds[u.index()] instanceof Formula.Constant)
          || !(upperBounds[u.index()] instanceof Formula.Constant)) {
        Frame frame = new Frame(Double.NaN, state);
        double lo = Evaluator.compile(lowerBounds[u.index()], -1).eval(frame);
        double hi = Evaluator.compile(upperBounds[u.index()], -1).eval(frame);
        double v = finiteMiddle(lo, hi, state[u.index()]);
        state[u.index()] = u.discrete() ? Math.floor(v) : v;
      }
    }
    moveInsideCuts(state);
    return state;
  }

  /**
   * Moves each unknown whose support dependent arguments cut ({@link ArgumentBounds}) to the
   * middle of its cut support when it lies outside, one unknown at a time, for a few passes: a
   * binomial {@code p = alpha + beta * dose} at {@code alpha = beta = 0} is 0, so {@code alpha}
   * moves into (0, 1) given {@code beta}. Each move keeps every earlier unknown inside its own cut
   * (they are cut given the others' current values), so the state only gets more valid; a cut
   * left empty (the others' values admit no value) is left for the starting-value check to name.
   */
  private void moveInsideCuts(double[] state) {
    for (int pass = 0; pass < 3; pass++) {
      boolean moved = false;
      for (Unknown u : unknowns) {
        int i = u.index();
        if (cuts[i].none() || u.discrete()) {
          continue;
        }
        Frame frame = new Frame(Double.NaN, state);
        double lo = Math.max(Evaluator.compile(lowerBounds[i], -1).eval(frame),
            cuts[i].lower(state));
        double hi = Math.min(Evaluator.compile(upperBounds[i], -1).eval(frame),
            cuts[i].upper(state));
        if (lo < hi && !(state[i] > lo && state[i] < hi)) {
          state[i] = finiteMiddle(lo, hi, state[i]);
          moved = true;
        }
      }
      if (!moved) {
        return;
      }
    }
  }

  /**
   * The compiled full conditional of unknown {@code index}, compiled on first use: an allocation
   * ({@link #allocation}) reads its row of its name's shared templates ({@link AllocationRows})
   * where its name's allocations allow it, every other unknown has its own {@link
   * CompiledConditional}.
   */
  public ConditionalDensity conditional(int index) {
    checkIndex(index);
    ConditionalDensity c = conditionals.get(index);
    if (c == null) {
      AllocationRows shared =
          unknowns.get(index).discrete() && allocation(index) ? allocationRows(index) : null;
      c = shared != null ? shared.conditional(index) : compiled(index, true);
      conditionals.compareAndSet(index, null, c);
      c = conditionals.get(index);
    }
    return c;
  }

  /**
   * The shared templates of the allocations of allocation {@code index}'s name, built on the
   * first call for any of them; {@code null} when its name's allocations cannot share templates.
   */
  private AllocationRows allocationRows(int index) {
    String node = unknowns.get(index).node();
    Object known = allocationRows.get(node);
    if (known == null) {
      synchronized (allocationRows) {
        known = allocationRows.get(node);
        if (known == null) {
          List<Unknown> members = new ArrayList<>();
          for (Unknown u : unknowns) {
            if (u.node().equals(node) && u.discrete() && allocation(u.index())) {
              members.add(u);
            }
          }
          AllocationRows built = AllocationRows.of(members, this::blanket, s -> new AllocationRows.Facts(
                  lowerBounds[s], upperBounds[s], cuts[s], smooth[s]));
          known = built == null ? Boolean.FALSE : built;
          allocationRows.put(node, known);
        }
      }
    }
    return known instanceof AllocationRows rows ? rows : null;
  }

  /**
   * Unknown {@code index}'s conditional compiled alone, from its blanket, whatever its kind (for
   * tests: an allocation's shared row must equal it); not cached.
   */
  CompiledConditional compiled(int index) {
    return compiled(index, true);
  }

  /**
   * Unknown {@code index}'s conditional compiled alone, its terms grouped by shape or, with
   * {@code grouped} false, one evaluator a term (the reference of the grouped form).
   */
  CompiledConditional compiled(int index, boolean grouped) {
    checkIndex(index);
    return new CompiledConditional(
        unknowns.get(index), blanket(index), lowerBounds[index], upperBounds[index], cuts[index],
        smooth[index], grouped);
  }

  /** Unknown {@code index}'s blanket, own term first, each term made when read. */
  private List<Term> blanket(int index) {
    // Each term made when read: the compiler reads each once, keeps its numbers in columns and
    // drops it, so the blanket is never held as terms.
    int own = ownTerm[index];
    int[] rest = dependents[index];
    return new java.util.AbstractList<>() {
      @Override
      public Term get(int k) {
        return terms.get(k == 0 ? own : rest[k - 1]);
      }

      @Override
      public int size() {
        return rest.length + 1;
      }
    };
  }


  /** The update chosen for unknown {@code index}, with its reason. */
  public Update update(int index) {
    checkIndex(index);
    return updates[index];
  }

  /**
   * The update unknown {@code index} would have on its own, were it in no linear-normal block
   * (the same as {@link #update} for unknowns outside blocks): for comparisons with the block.
   */
  public Update singleUpdate(int index) {
    checkIndex(index);
    return singleUpdates[index];
  }

  /**
   * Whether unknown {@code index}'s blanket follows an allocation: some dependent term reaches it
   * through an unknown index only ({@link UnknownIndex}), so that a draw evaluates the candidates
   * whose allocation currently selects it and leaves the others out; {@code check} says so.
   */
  public boolean dynamicBlanket(int index) {
    return anyDependent(index, UnknownIndex::selects);
  }

  /** Whether {@code test} holds for some term that depends on unknown {@code index}. */
  private boolean anyDependent(int index, java.util.function.BiPredicate<Term, Integer> test) {
    checkIndex(index);
    for (Term t : unansweredTerms(index, StatementFormula::noUnknownIndex)) {
      if (test.test(t, index)) {
        return true;
      }
    }
    return false;
  }

  /**
   * The components of the model's mixtures: for each name whose elements are selected through an
   * unknown index ({@link #dynamicBlanket}), the labels of those elements, in slot order. The
   * report checks whether chains order them differently (label switching).
   */
  public List<List<String>> components() {
    Map<String, List<String>> byNode = new java.util.LinkedHashMap<>();
    for (Unknown u : unknowns) {
      if (dynamicBlanket(u.index())) {
        byNode.computeIfAbsent(u.node(), k -> new ArrayList<>()).add(u.label());
      }
    }
    return byNode.values().stream().map(List::copyOf).toList();
  }

  /**
   * Whether unknown {@code index} is read by an unknown index ({@code group_of[i]} in {@code
   * mu[group_of[i]]}): an allocation, whose conditional compares the elements it may select.
   */
  public boolean allocation(int index) {
    return anyDependent(index, UnknownIndex::indexedBy);
  }

  /**
   * How many terms depend on unknown {@code index} (its blanket without itself): {@code check}
   * shows the count, and {@link #dependentLabels} would make a label per row to count them.
   */
  public int dependentCount(int index) {
    checkIndex(index);
    return dependents[index].length;
  }

  /**
   * The extra updates that move several unknowns at once along a line ({@link Update.GroupMove},
   * {@link Update.DirectionBlock}), each with its reason, found from the model's structure by
   * {@link MovePatterns} on the first call.
   */
  public List<Update> moves() {
    List<Update> found = moves;
    if (found == null) {
      found = List.copyOf(MovePatterns.find(facts()));
      moves = found;
    }
    return found;
  }

  /** What {@link MovePatterns} reads of this model. */
  MovePatterns.Facts facts() {
    return new MovePatterns.Facts(terms, ownTerm, dependents, unknowns, updates, cuts, smooth);
  }

  /** Labels of the terms that depend on unknown {@code index} (its blanket without itself). */
  public List<String> dependentLabels(int index) {
    checkIndex(index);
    List<String> labels = new ArrayList<>();
    for (int t : dependents[index]) {
      labels.add(terms.get(t).label());
    }
    return labels;
  }

  /**
   * The joint log-density of the model at {@code state} (natural scale, every unknown), with
   * every family's normalising constants and truncation normalisers; no Jacobians. Compiled on
   * first use; it sums every term, so the Gibbs driver should use {@link #conditional} instead.
   */
  public double logDensity(double[] state) {
    if (state == null || state.length != unknowns.size()) {
      throw new IllegalArgumentException(
          "state must hold " + unknowns.size() + " values, got "
              + (state == null ? "null" : state.length));
    }
    Evaluator[][] compiled = compiledTerms();
    double total = 0;
    Frame frame = new Frame(Double.NaN, state);
    for (int i = 0; i < compiled.length; i++) {
      double term = termLogDensity(i, compiled[i], frame);
      if (term == Double.NEGATIVE_INFINITY && terms.get(i).truncated()) {
        return term;
      }
      total += term;
    }
    return total;
  }

  /**
   * Which term of unknown {@code index}'s conditional (its own term or one that depends on it)
   * has a log-density of {@code -inf}, {@code +inf} or NaN at {@code state}, and why, as in {@code
   * "y ~ uniform(lower = 0, upper = 1) at m.hbm:3:6 has log-density -inf: a uniform value must
   * lie in [lower, upper] = [0, 1], got 2"}; {@code null} when every one is finite.
   */
  public String termWithoutDensity(int index, double[] state) {
    checkIndex(index);
    Evaluator[][] compiled = compiledTerms();
    Frame frame = new Frame(Double.NaN, state);
    List<Integer> blanket = new ArrayList<>();
    blanket.add(ownTerm[index]);
    for (int t : dependents[index]) {
      blanket.add(t);
    }
    for (int i : blanket) {
      double value = termLogDensity(i, compiled[i], frame);
      if (Double.isFinite(value)) {
        continue;
      }
      Term t = terms.get(i);
      double y = compiled[i][0].eval(frame);
      double[] a = new double[t.arguments().size()];
      StringBuilder call = new StringBuilder(t.familyName()).append('(');
      for (int k = 0; k < a.length; k++) {
        a[k] = compiled[i][1 + k].eval(frame);
        call.append(k == 0 ? "" : ", ").append(t.argumentName(k)).append(" = ")
            .append(Binder.number(a[k]));
      }
      call.append(')');
      String why = t.family().checkArguments(a);
      if (why == null) {
        why = t.family().checkValue(y, a);
      }
      if (why == null && t.truncated() && !(y >= t.lower() && y <= t.upper())) {
        why = "the value lies outside within " + Binder.number(t.lower()) + " .. "
            + Binder.number(t.upper());
      }
      return t.label() + " = " + Binder.number(y) + " ~ " + call + " at " + t.position()
          + " has log-density " + (Double.isNaN(value) ? "NaN" : value > 0 ? "+inf" : "-inf")
          + (why == null ? "" : ": " + why);
    }
    return null;
  }

  /** The term's log-density at the frame's state, truncation normaliser included. */
  private double termLogDensity(int i, Evaluator[] compiled, Frame frame) {
    Term t = terms.get(i);
    double y = compiled[0].eval(frame);
    double[] a = new double[t.arguments().size()];
    for (int k = 0; k < a.length; k++) {
      a[k] = compiled[1 + k].eval(frame);
    }
    double value = t.family().logDensity(y, a);
    if (t.truncated()) {
      if (!(y >= t.lower() && y <= t.upper())) {
        return Double.NEGATIVE_INFINITY;
      }
      value -= t.family().logProbabilityBetween(t.lower(), t.upper(), a, new double[a.length]);
    }
    return value;
  }

  /** Value and argument evaluators of every term, compiled on first use. */
  private Evaluator[][] compiledTerms() {
    Evaluator[][] compiled = joint;
    if (compiled == null) {
      compiled = new Evaluator[terms.size()][];
      for (int i = 0; i < compiled.length; i++) {
        Term t = terms.get(i);
        compiled[i] = new Evaluator[1 + t.arguments().size()];
        compiled[i][0] = Evaluator.compile(t.value(), -1);
        for (int k = 0; k < t.arguments().size(); k++) {
          compiled[i][1 + k] = Evaluator.compile(t.arguments().get(k), -1);
        }
      }
      joint = compiled;
    }
    return compiled;
  }

  /** Every element-level term, in binding order (for {@link PriorSimulation}). */
  List<Term> terms() {
    return terms;
  }

  /** The bound {@code check} statements, in written order (for {@link TestQuantities}). */
  List<Binder.CheckFormula> checks() {
    return checks;
  }

  /** The own term (prior, or a missing observation's likelihood) of slot {@code index}. */
  Term ownTerm(int index) {
    checkIndex(index);
    return terms.get(ownTerm[index]);
  }

  /**
   * The terms that depend on unknown {@code index}, each made when read: a pass over them holds
   * one at a time, not one per row ({@link TermTable}).
   */
  /** The dependent terms of unknown {@code index}, each made when read (for the analyses' tests). */
  List<Term> dependents(int index) {
    checkIndex(index);
    return dependentTerms(index);
  }

  private List<Term> dependentTerms(int index) {
    return TermTable.at(terms, dependents[index]);
  }

  /**
   * The dependent terms of unknown {@code index} but those of statements that answer {@code
   * answered} for every row at once (all of them when the terms are not a {@link TermTable}).
   */
  private List<Term> unansweredTerms(
      int index, java.util.function.Predicate<StatementFormula> answered) {
    int[] left = terms instanceof TermTable table
        ? table.unanswered(dependents[index], answered) : dependents[index];
    return TermTable.at(terms, left);
  }

  private void checkIndex(int index) {
    if (index < 0 || index >= unknowns.size()) {
      throw new IllegalArgumentException(
          "index must be in 0 .. " + (unknowns.size() - 1) + ", got " + index);
    }
  }

  /** The support of the own term's value on the natural scale, intersected with truncation. */
  static Formula[] support(Term own) {
    Formula lo;
    Formula hi;
    switch (own.family().support()) {
      case POSITIVE:
        lo = Formula.constant(0);
        hi = Formula.constant(Double.POSITIVE_INFINITY);
        break;
      case UNIT_INTERVAL:
      case BINARY:
        lo = Formula.constant(0);
        hi = Formula.constant(1);
        break;
      case BETWEEN_FIRST_TWO_ARGUMENTS:
        lo = own.arguments().get(0);
        hi = own.arguments().get(1);
        break;
      case COUNT:
        lo = Formula.constant(0);
        hi = Formula.constant(Double.POSITIVE_INFINITY);
        break;
      case COUNT_UP_TO_FIRST_ARGUMENT:
        lo = Formula.constant(0);
        hi = own.arguments().get(0);
        break;
      case WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS:
        lo = own.arguments().get(0);
        hi = own.arguments().get(1);
        break;
      case CATEGORY:
        lo = Formula.constant(1);
        hi = Formula.constant(own.arguments().size());
        break;
      default:
        lo = Formula.constant(Double.NEGATIVE_INFINITY);
        hi = Formula.constant(Double.POSITIVE_INFINITY);
    }
    if (own.truncated()) {
      lo = Formulas.apply(Op.MAX, List.of(lo, Formula.constant(own.lower())));
      hi = Formulas.apply(Op.MIN, List.of(hi, Formula.constant(own.upper())));
    }
    return new Formula[] {lo, hi};
  }

  private double startingValue(Unknown u, Term own) {
    double lo = u.lower();
    double hi = u.upper();
    double guess;
    switch (own.family().support()) {
      case POSITIVE:
        guess = 1;
        break;
      case UNIT_INTERVAL:
        guess = 0.5;
        break;
      default:
        guess = 0;
    }
    for (String location : List.of("mean", "location", "rate")) {
      Formula f = own.argument(location);
      if (f instanceof Formula.Constant c && Double.isFinite(c.value())
          && (own.family().support() == org.hullbound.model.family.SupportKind.REAL
              || u.discrete())) {
        guess = c.value();
      }
    }
    if (Double.isNaN(lo) || Double.isNaN(hi)) {
      return u.discrete() ? Math.floor(guess) : guess;
    }
    double v = guess >= lo && guess <= hi && !(guess == lo && lo == 0 && !u.discrete())
        ? guess : finiteMiddle(lo, hi, guess);
    return u.discrete() ? Math.floor(v) : v;
  }

  private static double finiteMiddle(double lo, double hi, double guess) {
    if (Double.isFinite(lo) && Double.isFinite(hi)) {
      return lo + (hi - lo) / 2;
    }
    if (Double.isFinite(lo)) {
      return guess > lo ? guess : lo + 1;
    }
    if (Double.isFinite(hi)) {
      return guess < hi ? guess : hi - 1;
    }
    return guess;
  }
}
