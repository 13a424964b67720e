package org.hullbound.model;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.random.RandomGenerator;
import org.hullbound.model.family.Censored;

/**
 * The test quantities of a posterior predictive check (Gelman, Meng and Stern 1996, Statistica
 * Sinica 6, 733-807) for every modelled data name of a bound model, and the replication of that
 * data from its likelihood given one state of the unknowns.
 *
 * <p>Why here: replicating data needs each observed element's family, arguments and truncation,
 * which only the bound model holds. Per modelled name the default quantities are its mean, sd,
 * minimum and maximum, and for a count family its share of zeros, all over the observed elements
 * only: a missing (imputed) element is left out of both sides. Each {@code check} statement of
 * the model file adds one quantity T(y, theta) over its data name; there a missing element takes
 * its imputed value of the same sweep on the observed side (a completed-data check, Gelman, Van
 * Mechelen, Verbeke, Heitjan and Meulders 2005, Biometrics 61) and its replicated value on the
 * other, and the unknowns are the sweep's own on both sides.
 *
 * <pre>{@code
 * TestQuantities tests = TestQuantities.of(model);
 * TestQuantities.Replicator replicator = tests.replicator();      // one per chain
 * replicator.evaluate(state, rng, observed, replicated);           // one kept sweep
 * }</pre>
 */
public final class TestQuantities {
  /** Families of counts, whose share of zeros is a default quantity. */
  private static final Set<String> COUNT_FAMILIES =
      Set.of("poisson", "binomial", "bernoulli", "negative-binomial");

  /** The default quantities, in the order they are listed for each name. */
  public static final List<String> DEFAULT_STATISTICS = List.of("mean", "sd", "min", "max");

  /** The default quantity added for count families. */
  public static final String ZERO_SHARE = "zero_share";

  /** A modelled data name: its family, and how many of its elements are observed and missing. */
  public record CheckedNode(String name, String family, int observed, int missing) {}

  /**
   * One test quantity: the data name it is about, its name ({@link #DEFAULT_STATISTICS}, {@link
   * #ZERO_SHARE} or a check's own name), and whether it comes from a {@code check} statement.
   */
  public record Quantity(String node, String statistic, boolean fromModelFile) {}

  private final int unknowns;
  private final List<CheckedNode> checkedNodes = new ArrayList<>();
  private final List<Quantity> quantities = new ArrayList<>();
  private final BoundModel model;
  /** Per node: the indexes of its element terms in the model, in element order. */
  private final List<int[]> termIndexes = new ArrayList<>();
  /** Per node: its element terms and their compiled arguments, made when first replicated. */
  private volatile Elements elements;
  /** Per node: which default statistics it has (sd needs two observed elements). */
  private final List<List<String>> statistics = new ArrayList<>();
  /** Per check: its node's index and its compiled value. */
  private final List<Integer> checkNode = new ArrayList<>();
  private final List<Evaluator> checkValue = new ArrayList<>();

  private TestQuantities(BoundModel model) {
    this.model = model;
    this.unknowns = model.unknowns().size();
    // A censored row has no observed value to set a replicate against, and leaving only its
    // exact rows in would compare a selected sample; so a censored line is not checked at all.
    // One pass over the terms, holding indexes, not terms: check lists these quantities for a
    // model of millions of rows, whose terms are made when read (TermTable).
    Set<String> censoredLine = new HashSet<>();
    Map<String, IndexList> byNode = new LinkedHashMap<>();
    Map<String, String> familyOf = new HashMap<>();
    Map<String, Integer> missingOf = new HashMap<>();
    List<Term> all = model.terms();
    TermTable table = all instanceof TermTable tt ? tt : null;
    for (int t = 0; t < all.size(); t++) {
      // a row of a statement formula: its name, family and owner without its term made
      StatementFormula statement = table == null ? null : table.statementOf(t);
      Term term = statement == null ? all.get(t) : null;
      String name = term != null ? term.names().name() : statement.names().name();
      org.hullbound.model.family.Parametrisation family =
          term != null ? term.family() : statement.family();
      int owner = term != null ? term.owner() : statement.owner(table.rowOf(t));
      if (Censored.isCensored(family)) {
        censoredLine.add(name);
      }
      boolean observed = owner < 0;
      if (observed || model.unknowns().get(owner).imputed()) {
        byNode.computeIfAbsent(name, k -> new IndexList()).add(t);
        familyOf.putIfAbsent(name, family.family().name());
        missingOf.merge(name, observed ? 0 : 1, Integer::sum);
      }
    }
    byNode.keySet().removeAll(censoredLine);
    Map<String, Integer> nodeIndex = new LinkedHashMap<>();
    for (Map.Entry<String, IndexList> entry : byNode.entrySet()) {
      int[] indexes = entry.getValue().toArray();
      int missing = missingOf.get(entry.getKey());
      String family = familyOf.get(entry.getKey());
      CheckedNode node =
          new CheckedNode(entry.getKey(), family, indexes.length - missing, missing);
      List<String> own = new ArrayList<>();
      for (String statistic : DEFAULT_STATISTICS) {
        if (node.observed() >= (statistic.equals("sd") ? 2 : 1)) {
          own.add(statistic);
        }
      }
      if (COUNT_FAMILIES.contains(family) && node.observed() >= 1) {
        own.add(ZERO_SHARE);
      }
      nodeIndex.put(node.name(), checkedNodes.size());
      checkedNodes.add(node);
      termIndexes.add(indexes);
      statistics.add(own);
      for (String statistic : own) {
        quantities.add(new Quantity(node.name(), statistic, false));
      }
    }
    for (Binder.CheckFormula check : model.checks()) {
      checkNode.add(nodeIndex.get(check.node()));
      checkValue.add(Evaluator.compile(check.value(), -1));
      quantities.add(new Quantity(check.node(), check.name(), true));
    }
  }

  /** Each checked node's element terms and their compiled arguments. */
  private record Elements(List<Term[]> terms, List<Evaluator[][]> arguments) {}

  /** The checked nodes' terms with their arguments compiled, made on the first replication. */
  private Elements elements() {
    Elements made = elements;
    if (made == null) {
      synchronized (this) {
        made = elements;
        if (made == null) {
          List<Term[]> terms = new ArrayList<>();
          List<Evaluator[][]> arguments = new ArrayList<>();
          for (int[] indexes : termIndexes) {
            Term[] node = new Term[indexes.length];
            Evaluator[][] args = new Evaluator[indexes.length][];
            for (int e = 0; e < indexes.length; e++) {
              node[e] = model.terms().get(indexes[e]);
              args[e] = PriorSimulation.compile(node[e].arguments());
            }
            terms.add(node);
            arguments.add(args);
          }
          made = new Elements(List.copyOf(terms), List.copyOf(arguments));
          elements = made;
        }
      }
    }
    return made;
  }

  /** A growing list of term indexes. */
  private static final class IndexList {
    private int[] values = new int[8];
    private int size;

    void add(int value) {
      if (size == values.length) {
        values = java.util.Arrays.copyOf(values, 2 * size);
      }
      values[size++] = value;
    }

    int[] toArray() {
      return java.util.Arrays.copyOf(values, size);
    }
  }

  /**
   * The test quantities of {@code model}.
   *
   * @throws IllegalArgumentException if {@code model} is null
   */
  public static TestQuantities of(BoundModel model) {
    if (model == null) {
      throw new IllegalArgumentException("model must not be null");
    }
    return new TestQuantities(model);
  }

  /** The modelled data names, in statement order. */
  public List<CheckedNode> nodes() {
    return List.copyOf(checkedNodes);
  }

  /** Every test quantity, in the order {@link Replicator#evaluate} writes them. */
  public List<Quantity> quantities() {
    return List.copyOf(quantities);
  }

  /** Labels of node {@code node}'s elements ({@code y[1]}, ...), in element order. */
  public List<String> elementLabels(int node) {
    List<String> labels = new ArrayList<>();
    for (Term term : elements().terms().get(node)) {
      labels.add(term.label());
    }
    return labels;
  }

  /** Scratch space for one chain: replicated data and the state extended by a name's values. */
  public Replicator replicator() {
    return new Replicator();
  }

  /**
   * Replicates the data and evaluates every quantity for one state; one per chain, as it keeps
   * buffers (not thread-safe).
   */
  public final class Replicator {
    private final List<Term[]> terms = elements().terms();
    private final List<Evaluator[][]> arguments = elements().arguments();
    private final double[][] replicated = new double[terms.size()][];
    private final double[][] completed = new double[terms.size()][];
    private final double[] row;

    private Replicator() {
      int width = 0;
      for (int n = 0; n < terms.size(); n++) {
        replicated[n] = new double[terms.get(n).length];
        completed[n] = new double[unknowns + terms.get(n).length];
        width += terms.get(n).length;
      }
      row = new double[width];
    }

    /**
     * Draws every modelled element from its likelihood at {@code state} (natural scale) and
     * writes each quantity's observed and replicated value, in {@link #quantities()} order.
     *
     * @throws SimulationException when a likelihood cannot be drawn at {@code state}
     */
    public void evaluate(
        double[] state, RandomGenerator rng, double[] observedOut, double[] replicatedOut) {
      if (state == null || state.length < unknowns) {
        throw new IllegalArgumentException(
            "state must hold the " + unknowns + " unknowns, got "
                + (state == null ? "null" : state.length));
      }
      Frame frame = new Frame(Double.NaN, state);
      int q = 0;
      for (int n = 0; n < terms.size(); n++) {
        Term[] elements = terms.get(n);
        Evaluator[][] args = arguments.get(n);
        double[] completedData = completed[n];
        System.arraycopy(state, 0, completedData, 0, unknowns);
        for (int e = 0; e < elements.length; e++) {
          Term term = elements[e];
          replicated[n][e] =
              PriorSimulation.draw(term, PriorSimulation.evaluate(args[e], frame), rng,
                  "the replicate of ");
          completedData[unknowns + e] =
              term.owner() >= 0 ? state[term.owner()] : ((Formula.Constant) term.value()).value();
        }
        double[] observedSummary = summary(elements, completedData, unknowns);
        double[] replicatedSummary = summary(elements, replicated[n], 0);
        for (String statistic : statistics.get(n)) {
          int k = statistic.equals(ZERO_SHARE) ? 4 : DEFAULT_STATISTICS.indexOf(statistic);
          observedOut[q] = observedSummary[k];
          replicatedOut[q] = replicatedSummary[k];
          q++;
        }
      }
      for (int c = 0; c < checkValue.size(); c++) {
        int n = checkNode.get(c);
        double[] extended = completed[n].clone();
        observedOut[q] = checkValue.get(c).eval(new Frame(Double.NaN, extended));
        System.arraycopy(replicated[n], 0, extended, unknowns, replicated[n].length);
        replicatedOut[q] = checkValue.get(c).eval(new Frame(Double.NaN, extended));
        q++;
      }
    }

    /** Node {@code node}'s replicated values of the last {@link #evaluate}, in element order. */
    public double[] replicatedData(int node) {
      return replicated[node].clone();
    }

    /**
     * Every node's replicated values of the last {@link #evaluate}, node after node, each in
     * element order; the array is reused by the next call.
     */
    public double[] replicatedRow() {
      int at = 0;
      for (double[] values : replicated) {
        System.arraycopy(values, 0, row, at, values.length);
        at += values.length;
      }
      return row;
    }
  }

  /**
   * Mean, sd, min, max and share of zeros over the observed elements; {@code values[from + e]} is
   * element e.
   */
  private static double[] summary(Term[] elements, double[] values, int from) {
    long count = 0;
    double mean = 0;
    double squares = 0;
    double min = Double.POSITIVE_INFINITY;
    double max = Double.NEGATIVE_INFINITY;
    long zeros = 0;
    double sum = 0;
    for (int e = 0; e < elements.length; e++) {
      if (elements[e].owner() >= 0) {
        continue;
      }
      double v = values[from + e];
      count++;
      sum += v;
      // Welford's update (Welford 1962, Technometrics 4): no cancellation of large sums of squares.
      double delta = v - mean;
      mean += delta / count;
      squares += delta * (v - mean);
      min = Math.min(min, v);
      max = Math.max(max, v);
      zeros += v == 0 ? 1 : 0;
    }
    // The plain sum for the mean: exact for counts, where Welford's running mean is not.
    return new double[] {sum / count, Math.sqrt(squares / (count - 1)), min, max, (double) zeros / count};
  }
}
