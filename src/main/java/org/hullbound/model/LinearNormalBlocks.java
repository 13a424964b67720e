package org.hullbound.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Finds blocks of unknowns whose joint full conditional is multivariate normal, and builds the
 * rule that computes its canonical form (precision Q, linear term b) from the current state.
 *
 * <p>Why: coefficients of a regression with correlated covariates mix slowly one at a time; drawn
 * jointly they are independent across sweeps (Gelman et al., Bayesian Data Analysis, 3rd ed.,
 * section 14.2, and the blocking argument of Liu, Wong and Kong 1994).
 *
 * <p>The rule: an unknown is a candidate when it is a param (not a missing observation) and every
 * term of its Markov blanket (its prior and the terms that read it) is an untruncated normal
 * reading it only in its value and mean. Candidates that share a term are grouped. A group of two
 * or more becomes a block when, for every term that reads a member, the residual {@code value -
 * mean} is affine in the members jointly (checked structurally) and its spread reads none of
 * them. Each such term contributes {@code -p/2 (e + c'beta)^2} to the log-density, with {@code p}
 * its precision, {@code c} the residual's derivative in each member (forward mode) and {@code e}
 * the residual with the members at 0; so Q is the sum of {@code p c c'} and b of {@code -p e c}.
 */
final class LinearNormalBlocks {
  /** Above this size the dense Cholesky factor (cubic in the size) costs more than it saves. */
  static final int MAXIMUM_SIZE = 60;

  private LinearNormalBlocks() {}

  /**
   * The blocks of a model, each as a sorted array of slots.
   *
   * @param terms every term of the model
   * @param blankets for each slot, the indices of its own term and of the terms that read it
   */
  static List<int[]> find(List<Term> terms, int[][] blankets, boolean[] imputed) {
    int n = blankets.length;
    boolean[] candidate = new boolean[n];
    for (int s = 0; s < n; s++) {
      candidate[s] = !imputed[s] && candidate(s, terms, blankets[s]);
    }
    int[] parent = new int[n];
    for (int s = 0; s < n; s++) {
      parent[s] = s;
    }
    Map<Integer, Integer> firstReader = new LinkedHashMap<>();
    for (int s = 0; s < n; s++) {
      if (!candidate[s]) {
        continue;
      }
      for (int t : blankets[s]) {
        Integer other = firstReader.putIfAbsent(t, s);
        if (other != null) {
          union(parent, other, s);
        }
      }
    }
    Map<Integer, List<Integer>> groups = new LinkedHashMap<>();
    for (int s = 0; s < n; s++) {
      if (candidate[s]) {
        groups.computeIfAbsent(find(parent, s), k -> new ArrayList<>()).add(s);
      }
    }
    List<int[]> blocks = new ArrayList<>();
    for (List<Integer> group : groups.values()) {
      int[] members = group.stream().mapToInt(Integer::intValue).sorted().toArray();
      if (members.length >= 2 && members.length <= MAXIMUM_SIZE
          && jointlyAffine(members, terms, blankets)) {
        blocks.add(members);
      }
    }
    return blocks;
  }

  /** The update of a verified block. */
  static Update.LinearNormalBlock update(int[] members, List<Term> terms, int[][] blankets) {
    Set<Integer> reading = new LinkedHashSet<>();
    for (int s : members) {
      for (int t : blankets[s]) {
        reading.add(t);
      }
    }
    List<TermRule> rules = new ArrayList<>();
    for (int t : reading) {
      rules.add(TermRule.of(terms.get(t), members));
    }
    int k = members.length;
    int[] slots = members.clone();
    Update.CanonicalRule rule =
        state -> {
          double[][] q = new double[k][k];
          double[] b = new double[k];
          double[] atZero = state.clone();
          for (int s : slots) {
            atZero[s] = 0;
          }
          double[] c = new double[k];
          for (TermRule term : rules) {
            term.accumulate(atZero, q, b, c);
          }
          return new Update.Canonical(q, b);
        };
    return new Update.LinearNormalBlock(
        members,
        "exact joint draw of " + k + ": every term reading them is normal, with value minus mean"
            + " affine in them jointly and a spread free of them",
        rule);
  }

  /** A normal term's contribution, compiled once per member it reads. */
  private record TermRule(int[] positions, Evaluator[] values, Evaluator[] means, Spread spread) {
    static TermRule of(Term t, int[] members) {
      List<Integer> read = new ArrayList<>();
      for (int p = 0; p < members.length; p++) {
        if (t.value().reads(members[p]) || t.argument("mean").reads(members[p])) {
          read.add(p);
        }
      }
      int[] positions = read.stream().mapToInt(Integer::intValue).toArray();
      Evaluator[] values = new Evaluator[positions.length];
      Evaluator[] means = new Evaluator[positions.length];
      for (int i = 0; i < positions.length; i++) {
        values[i] = Evaluator.compile(t.value(), members[positions[i]]);
        means[i] = Evaluator.compile(t.argument("mean"), members[positions[i]]);
      }
      return new TermRule(positions, values, means, Spread.of(t));
    }

    void accumulate(double[] atZero, double[][] q, double[] b, double[] c) {
      double precision = spread.precision(atZero);
      double residual = 0;
      for (int i = 0; i < positions.length; i++) {
        Frame frame = new Frame(0, atZero);
        double y = values[i].eval(frame);
        double dy = frame.slope;
        double m = means[i].eval(frame);
        c[i] = dy - frame.slope;
        residual = y - m;
      }
      for (int i = 0; i < positions.length; i++) {
        b[positions[i]] -= precision * residual * c[i];
        for (int j = 0; j < positions.length; j++) {
          q[positions[i]][positions[j]] += precision * c[i] * c[j];
        }
      }
    }
  }

  /** The precision of a normal term from whichever of sd, var, precision it has. */
  private record Spread(String name, Evaluator value) {
    static Spread of(Term t) {
      for (String name : List.of("sd", "var", "precision")) {
        Formula f = t.argument(name);
        if (f != null) {
          return new Spread(name, Evaluator.compile(f, -1));
        }
      }
      throw new IllegalStateException("a normal term without a spread argument: " + t.label());
    }

    double precision(double[] state) {
      double v = value.eval(new Frame(Double.NaN, state));
      switch (name) {
        case "sd":
          return 1 / (v * v);
        case "var":
          return 1 / v;
        default:
          return v;
      }
    }
  }

  private static boolean candidate(int s, List<Term> terms, int[] blanket) {
    for (int index : blanket) {
      Term t = terms.get(index);
      if (!t.familyName().equals("normal") || t.truncated() || t.argument("mean") == null) {
        return false;
      }
      for (int k = 0; k < t.arguments().size(); k++) {
        if (!t.argumentName(k).equals("mean") && t.arguments().get(k).reads(s)) {
          return false;
        }
      }
    }
    return true;
  }

  private static boolean jointlyAffine(int[] members, List<Term> terms, int[][] blankets) {
    Set<Integer> set = new LinkedHashSet<>();
    for (int s : members) {
      set.add(s);
    }
    for (int s : members) {
      for (int index : blankets[s]) {
        Term t = terms.get(index);
        if (!affineIn(t.value(), set) || !affineIn(t.argument("mean"), set)) {
          return false;
        }
        for (int k = 0; k < t.arguments().size(); k++) {
          if (!t.argumentName(k).equals("mean") && readsAny(t.arguments().get(k), set)) {
            return false;
          }
        }
      }
    }
    return true;
  }

  /** True when {@code f} is affine in the slots of {@code set} jointly. */
  static boolean affineIn(Formula f, Set<Integer> set) {
    if (!readsAny(f, set) || f instanceof Formula.Slot) {
      return true;
    }
    Formula.Operation o = (Formula.Operation) f;
    List<Formula> p = o.parts();
    switch (o.op()) {
      case ADD:
        return p.stream().allMatch(part -> affineIn(part, set));
      case SUBTRACT:
        return affineIn(p.get(0), set) && affineIn(p.get(1), set);
      case NEGATE:
        return affineIn(p.get(0), set);
      case MULTIPLY:
        return (!readsAny(p.get(0), set) && affineIn(p.get(1), set))
            || (!readsAny(p.get(1), set) && affineIn(p.get(0), set));
      case DIVIDE:
        return !readsAny(p.get(1), set) && affineIn(p.get(0), set);
      default:
        return false;
    }
  }

  private static boolean readsAny(Formula f, Set<Integer> set) {
    Set<Integer> read = new LinkedHashSet<>();
    f.collectSlots(read);
    read.retainAll(set);
    return !read.isEmpty();
  }

  private static int find(int[] parent, int s) {
    while (parent[s] != s) {
      parent[s] = parent[parent[s]];
      s = parent[s];
    }
    return s;
  }

  private static void union(int[] parent, int a, int b) {
    int ra = find(parent, a);
    int rb = find(parent, b);
    if (ra != rb) {
      parent[Math.max(ra, rb)] = Math.min(ra, rb);
    }
  }
}
