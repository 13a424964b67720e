package org.hullbound.model;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import java.util.random.RandomGenerator;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.lang.SourcePosition;
import org.hullbound.model.family.FamilyDraws;

/**
 * Draws from the joint prior of a bound model, and simulates its observed data given those draws:
 * the generative direction that simulation-based calibration needs (Talts, Betancourt, Simpson,
 * Vehtari and Gelman 2018).
 *
 * <p>Why it exists: a fitted model is checked by fitting data simulated from that very model;
 * this class walks the model's terms in dependency order (ancestral sampling) and draws each from
 * its family with {@link FamilyDraws}. Unknowns are drawn in an order in which every argument an
 * unknown's own term reads is drawn before it (missing observations included, from their own
 * likelihood); then every observed data element is drawn from its likelihood given all the
 * unknowns. Covariates and index data stay as bound.
 *
 * <p>A simulated data element is returned with the place it came from (its data-file cell or its
 * inline value), so that a caller can write it back and bind the model again. A modelled data name
 * that also appears in other terms (a modelled covariate) cannot be simulated this way, because
 * binding has folded its value into those terms; callers check that at the syntax level.
 */
public final class PriorSimulation {
  private final BoundModel model;
  private final int[] order;
  private final Evaluator[][] ownArguments;
  /**
   * The observed data elements' terms with their compiled arguments, made on the first {@link
   * #simulateObservations}: a fit draws its starting values from the priors alone, and a term and
   * its evaluators per data row would hold hundreds of bytes a row (issue 14).
   */
  private volatile Observed observed;

  private record Observed(List<Term> terms, Evaluator[][] arguments) {}

  private PriorSimulation(BoundModel model) {
    this.model = model;
    int n = model.unknowns().size();
    this.ownArguments = new Evaluator[n][];
    List<Set<Integer>> reads = new ArrayList<>();
    for (int s = 0; s < n; s++) {
      Term own = model.ownTerm(s);
      ownArguments[s] = compile(own.arguments());
      Set<Integer> slots = new LinkedHashSet<>();
      for (Formula a : own.arguments()) {
        a.collectSlots(slots);
      }
      slots.remove(s);
      reads.add(slots);
    }
    this.order = ancestralOrder(reads);
  }

  private Observed observed() {
    Observed known = observed;
    if (known == null) {
      List<Term> list = new ArrayList<>();
      for (Term term : model.terms()) {
        if (term.owner() < 0) {
          list.add(term);
        }
      }
      Evaluator[][] arguments = new Evaluator[list.size()][];
      for (int t = 0; t < list.size(); t++) {
        arguments[t] = compile(list.get(t).arguments());
      }
      known = new Observed(List.copyOf(list), arguments);
      observed = known;
    }
    return known;
  }

  /**
   * The simulator of {@code model}.
   *
   * @throws IllegalArgumentException if {@code model} is null
   */
  public static PriorSimulation of(BoundModel model) {
    if (model == null) {
      throw new IllegalArgumentException("model must not be null");
    }
    return new PriorSimulation(model);
  }

  /** One simulated data element: its label, the cell or inline value it replaces, its value. */
  public record SimulatedValue(String label, SourcePosition origin, double value) {}

  /**
   * A draw of every unknown from the joint prior (natural scale, state order).
   *
   * @throws SimulationException when a prior cannot be drawn: its arguments, drawn from their own
   *     priors, are invalid (for example a scale that underflowed to 0), or a draw is not finite
   */
  public double[] drawUnknowns(RandomGenerator rng) {
    if (rng == null) {
      throw new IllegalArgumentException("rng must not be null");
    }
    double[] state = new double[model.unknowns().size()];
    Frame frame = new Frame(Double.NaN, state);
    for (int s : order) {
      Term own = model.ownTerm(s);
      double[] args = evaluate(ownArguments[s], frame);
      state[s] = draw(own, args, rng, "the prior of ");
    }
    return state;
  }

  /**
   * A draw of every observed data element from its likelihood given {@code state}, in binding
   * order (statement order, then element order).
   *
   * @throws SimulationException when a likelihood's arguments are invalid at {@code state}
   */
  public List<SimulatedValue> simulateObservations(double[] state, RandomGenerator rng) {
    if (state == null || state.length != model.unknowns().size()) {
      throw new IllegalArgumentException(
          "state must hold " + model.unknowns().size() + " values, got "
              + (state == null ? "null" : state.length));
    }
    if (rng == null) {
      throw new IllegalArgumentException("rng must not be null");
    }
    Frame frame = new Frame(Double.NaN, state);
    Observed all = observed();
    List<SimulatedValue> values = new ArrayList<>(all.terms().size());
    for (int t = 0; t < all.terms().size(); t++) {
      Term term = all.terms().get(t);
      double[] args = evaluate(all.arguments()[t], frame);
      double y = draw(term, args, rng, "the likelihood of ");
      SourcePosition origin =
          term.value() instanceof Formula.Constant ? term.valueCell() : term.position();
      values.add(new SimulatedValue(term.label(), origin, y));
    }
    return values;
  }

  /** How many observed data elements {@link #simulateObservations} draws. */
  public int observedCount() {
    return observed().terms().size();
  }

  static double draw(Term term, double[] args, RandomGenerator rng, String what) {
    String problem = term.family().checkArguments(args);
    if (problem != null) {
      throw new SimulationException(
          "cannot draw " + what + "'" + term.label() + "': " + term.family().signature() + " "
              + problem);
    }
    double x;
    try {
      x = term.truncated()
          ? FamilyDraws.drawBetween(term.family(), args, term.lower(), term.upper(), rng)
          : FamilyDraws.draw(term.family(), args, rng);
    } catch (IllegalArgumentException invalid) {
      throw new SimulationException(
          "cannot draw " + what + "'" + term.label() + "': " + invalid.getMessage());
    }
    if (!Double.isFinite(x)) {
      throw new SimulationException(
          "the draw of " + what + "'" + term.label() + "' from " + term.family().signature()
              + " is " + NumberSyntax.written(x) + "; simulation needs finite values");
    }
    return x;
  }

  static Evaluator[] compile(List<Formula> formulas) {
    Evaluator[] compiled = new Evaluator[formulas.size()];
    for (int k = 0; k < compiled.length; k++) {
      compiled[k] = Evaluator.compile(formulas.get(k), -1);
    }
    return compiled;
  }

  static double[] evaluate(Evaluator[] evaluators, Frame frame) {
    double[] args = new double[evaluators.length];
    for (int k = 0; k < args.length; k++) {
      args[k] = evaluators[k].eval(frame);
    }
    return args;
  }

  /**
   * Slots in an order where every slot comes after those it reads (depth-first topological sort;
   * binding has ruled out cycles between names, so none exist between elements).
   */
  private static int[] ancestralOrder(List<Set<Integer>> reads) {
    int n = reads.size();
    int[] mark = new int[n];
    int[] order = new int[n];
    int[] next = {0};
    for (int s = 0; s < n; s++) {
      visit(s, reads, mark, order, next);
    }
    return order;
  }

  private static void visit(int start, List<Set<Integer>> reads, int[] mark, int[] order, int[] next) {
    // Iterative, so that long chains of dependencies cannot exhaust the stack.
    if (mark[start] != 0) {
      return;
    }
    java.util.ArrayDeque<int[]> stack = new java.util.ArrayDeque<>();
    java.util.ArrayDeque<java.util.Iterator<Integer>> iterators = new java.util.ArrayDeque<>();
    stack.push(new int[] {start});
    iterators.push(reads.get(start).iterator());
    mark[start] = 1;
    while (!stack.isEmpty()) {
      java.util.Iterator<Integer> it = iterators.peek();
      if (it.hasNext()) {
        int child = it.next();
        if (mark[child] == 0) {
          mark[child] = 1;
          stack.push(new int[] {child});
          iterators.push(reads.get(child).iterator());
        } else if (mark[child] == 1) {
          throw new SimulationException("the priors depend on each other in a cycle");
        }
      } else {
        int done = stack.pop()[0];
        iterators.pop();
        mark[done] = 2;
        order[next[0]++] = done;
      }
    }
  }
}
