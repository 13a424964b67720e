package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;

/**
 * The member lists of a conditional whose blanket follows an allocation ({@link UnknownIndex}):
 * which of its candidate terms the allocation currently selects, kept up to date as the allocation
 * changes rather than found afresh from every candidate at every draw.
 *
 * <p>The conditional of {@code mu[k]} in {@code y[i] ~ normal(mean = mu[g[i]], ...)} has every row
 * as a candidate; row {@code i} is a member while its guard {@code [g[i] = k]} is 1. Each chain's
 * thread keeps a {@link Tracker}: the members as a bit set over the blanket's terms, each term's
 * prepared parts ({@code a} and {@code b} of its affine parts), and the inputs (the other
 * unknowns the terms read) as they were when those were worked out. At each evaluation the tracker
 * compares the inputs with the state, run by run of consecutive slots ({@link Arrays#mismatch},
 * which the JDK compares many at a time), and acts on the inputs that changed only: a changed
 * allocation {@code g[i]} evaluates again the guards that read it (row {@code i} leaves one list
 * and joins another; a row that joins is prepared) and prepares the parts of the members that read
 * it; a changed input that many terms read ({@code beta} in {@code mu[g[i]] + beta * x[i]})
 * prepares every member. Members are compiled in the form they take while selected ({@link
 * #memberForm}), so their parts do not read the allocation or the other components. A draw of
 * {@code mu[k]} thus costs the comparison of its inputs, the rows that moved since its last draw,
 * and its current members, never the other components' rows; an allocation's own draw is unchanged
 * (its blanket is its row). Nothing is trusted that was not compared against the state, so a list
 * can never be stale, whoever changed the allocation (a draw, a restart, a resumed chain).
 *
 * <p>Members are visited in blanket order (the bit set's order), so a value is summed in the same
 * order whatever the history of moves, and a resumed chain gives the same bits.
 */
final class AllocationMembers {
  /** An input read by the prepared parts of more than 1 / WIDE_SHARE of the terms prepares all. */
  private static final int WIDE_SHARE = 8;

  /** Works out the prepared parts of one term at the frame's state. */
  interface Preparation {
    void prepare(int term);
  }

  private final int termCount;
  /** Per term: the guards that select it ({@link UnknownIndex#guards}), null if always in. */
  private final Evaluator[][] guards;
  /** The inputs' slots, ascending, and where each run of consecutive slots starts in them. */
  private final int[] inputs;
  private final int[] runStart;
  /** Per input: the gated terms whose guards read it. */
  private final int[] guardStart;
  private final int[] guardTerms;
  /** Per input that is not wide: the terms whose formulas read it. */
  private final int[] partStart;
  private final int[] partTerms;
  private final boolean[] wide;

  private AllocationMembers(Evaluator[][] guards, int[] inputs, List<int[]> guardReaders,
      List<int[]> partReaders, boolean[] wide) {
    this.termCount = guards.length;
    this.guards = guards;
    this.inputs = inputs;
    List<Integer> starts = new ArrayList<>();
    for (int j = 0; j < inputs.length; j++) {
      if (j == 0 || inputs[j] != inputs[j - 1] + 1) {
        starts.add(j);
      }
    }
    starts.add(inputs.length);
    this.runStart = starts.stream().mapToInt(Integer::intValue).toArray();
    this.guardStart = new int[inputs.length + 1];
    this.guardTerms = flatten(guardReaders, guardStart);
    this.partStart = new int[inputs.length + 1];
    this.partTerms = flatten(partReaders, partStart);
    this.wide = wide;
  }

  private static int[] flatten(List<int[]> lists, int[] start) {
    int total = 0;
    for (int j = 0; j < lists.size(); j++) {
      start[j] = total;
      total += lists.get(j).length;
    }
    start[lists.size()] = total;
    int[] flat = new int[total];
    for (int j = 0; j < lists.size(); j++) {
      System.arraycopy(lists.get(j), 0, flat, start[j], lists.get(j).length);
    }
    return flat;
  }

  /**
   * The member lists of a blanket, or {@code null} when no term is gated (the blanket is fixed).
   *
   * @param blanket the conditional's terms, in its order, each in the form it is evaluated in
   *     ({@link #memberForm})
   * @param slot the conditional's own unknown
   * @param inputs the other unknowns' slots the terms read, ascending
   * @param guardFormulas per term, its guards ({@link UnknownIndex#guards}) or {@code null}
   * @param guards the same guards compiled
   */
  static AllocationMembers of(List<Term> blanket, int slot, int[] inputs,
      List<List<Formula>> guardFormulas, Evaluator[][] guards) {
    boolean any = false;
    for (Evaluator[] g : guards) {
      any |= g != null;
    }
    if (!any) {
      return null;
    }
    List<List<Integer>> guardReaders = new ArrayList<>();
    List<List<Integer>> partReaders = new ArrayList<>();
    for (int j = 0; j < inputs.length; j++) {
      guardReaders.add(new ArrayList<>());
      partReaders.add(new ArrayList<>());
    }
    Set<Integer> read = new TreeSet<>();
    for (int t = 0; t < blanket.size(); t++) {
      read.clear();
      Term term = blanket.get(t);
      term.value().collectSlots(read);
      for (Formula a : term.arguments()) {
        a.collectSlots(read);
      }
      addReader(read, slot, inputs, partReaders, t);
      if (guardFormulas.get(t) != null) {
        read.clear();
        for (Formula g : guardFormulas.get(t)) {
          g.collectSlots(read);
        }
        addReader(read, slot, inputs, guardReaders, t);
      }
    }
    boolean[] wide = new boolean[inputs.length];
    List<int[]> parts = new ArrayList<>();
    for (int j = 0; j < inputs.length; j++) {
      wide[j] = partReaders.get(j).size() > Math.max(1, blanket.size() / WIDE_SHARE);
      parts.add(wide[j] ? new int[0] : toArray(partReaders.get(j)));
    }
    return new AllocationMembers(guards, inputs,
        guardReaders.stream().map(AllocationMembers::toArray).toList(), parts, wide);
  }

  /**
   * Term {@code t} as it reads while its guard selects the unknown, when it has one guard {@code
   * [index = k]}: every indicator {@code [index = v]} of that index is then 1 for {@code v = k} and
   * 0 for every other {@code v}, so {@code mu[1] [g = 1] + mu[2] [g = 2]} becomes {@code mu[k]},
   * whose parts are affine in the unknown with {@code a} and {@code b} free of the allocation and
   * of the other components (often linear forms, worked out without a tree). A member is evaluated
   * only while selected, where both forms agree. A term with guards of several indexes, or none,
   * is kept as it is.
   */
  static Term memberForm(Term t, List<Formula> guards) {
    if (guards == null || guards.stream().distinct().count() != 1
        || !(guards.get(0) instanceof Formula.Operation guard)
        || !(guard.parts().get(1) instanceof Formula.Constant selected)) {
      return t;
    }
    Formula index = guard.parts().get(0);
    double k = selected.value();
    List<Formula> arguments = new ArrayList<>();
    for (Formula a : t.arguments()) {
      arguments.add(select(a, index, k));
    }
    return new Term(t.names(), t.element(), t.cells(), t.family(), select(t.value(), index, k),
        arguments, t.within(), t.owner(), t.position());
  }

  private static boolean indicatorOf(Formula f, Formula index) {
    return f instanceof Formula.Operation o && o.op() == Op.EQUAL
        && o.parts().get(0).equals(index) && o.parts().get(1) instanceof Formula.Constant;
  }

  /** {@code f} with the indicators of {@code index} at {@code index = k}. */
  private static Formula select(Formula f, Formula index, double k) {
    if (!(f instanceof Formula.Operation o)) {
      return f;
    }
    if (indicatorOf(f, index)) {
      return Formula.constant(((Formula.Constant) o.parts().get(1)).value() == k ? 1 : 0);
    }
    List<Formula> parts = new ArrayList<>();
    boolean changed = false;
    for (Formula part : o.parts()) {
      Formula selected = select(part, index, k);
      parts.add(selected);
      changed |= selected != part;
    }
    if (!changed) {
      return f;
    }
    if (o.op() == Op.MULTIPLY) {
      for (int side = 0; side < 2; side++) {
        if (indicatorOf(o.parts().get(side), index)) {
          // An option not selected is 0 whatever its value, as the compiled option is (Evaluator).
          return ((Formula.Constant) parts.get(side)).value() == 0
              ? Formula.constant(0) : parts.get(1 - side);
        }
      }
    }
    return Formulas.apply(o.op(), parts);
  }

  private static void addReader(
      Set<Integer> read, int slot, int[] inputs, List<List<Integer>> readers, int term) {
    for (int s : read) {
      if (s != slot) {
        readers.get(Arrays.binarySearch(inputs, s)).add(term);
      }
    }
  }

  private static int[] toArray(List<Integer> list) {
    return list.stream().mapToInt(Integer::intValue).toArray();
  }

  /** A tracker for one thread's workspace: nothing known until its first synchronisation. */
  Tracker tracker() {
    return new Tracker();
  }

  /** One thread's member set, and the inputs it and the prepared parts were worked out at. */
  final class Tracker {
    private final long[] members = new long[(termCount + 63) >>> 6];
    private final double[] values = new double[inputs.length];
    private boolean ready;

    /**
     * Brings the members and the prepared parts to the frame's state (the frame must be at it):
     * returns whether the member set changed, so that the caller lists the members again.
     */
    boolean sync(Frame frame, Preparation preparation) {
      double[] state = frame.state;
      if (!ready) {
        Arrays.fill(members, 0);
        for (int t = 0; t < termCount; t++) {
          if (guards[t] == null || selected(t, frame)) {
            members[t >>> 6] |= 1L << t;
            preparation.prepare(t);
          }
        }
        for (int j = 0; j < inputs.length; j++) {
          values[j] = state[inputs[j]];
        }
        ready = true;
        return true;
      }
      boolean moved = false;
      boolean everyMember = false;
      for (int r = 0; r + 1 < runStart.length; r++) {
        int from = runStart[r];
        int to = runStart[r + 1];
        int offset = inputs[from] - from;
        int j = from;
        while (j < to) {
          int m = Arrays.mismatch(state, j + offset, to + offset, values, j, to);
          if (m < 0) {
            break;
          }
          j += m;
          values[j] = state[inputs[j]];
          for (int k = guardStart[j]; k < guardStart[j + 1]; k++) {
            int t = guardTerms[k];
            boolean now = selected(t, frame);
            if (now != member(t)) {
              members[t >>> 6] ^= 1L << t;
              moved = true;
              // A member's form may not read the allocation that let it join: prepare it now.
              if (now && !everyMember) {
                preparation.prepare(t);
              }
            }
          }
          if (wide[j]) {
            everyMember = true;
          } else if (!everyMember) {
            for (int k = partStart[j]; k < partStart[j + 1]; k++) {
              if (member(partTerms[k])) {
                preparation.prepare(partTerms[k]);
              }
            }
          }
          j++;
        }
      }
      if (everyMember) {
        for (int w = 0; w < members.length; w++) {
          for (long bits = members[w]; bits != 0; bits &= bits - 1) {
            preparation.prepare((w << 6) + Long.numberOfTrailingZeros(bits));
          }
        }
      }
      return moved;
    }

    /** Writes the members into {@code into} in blanket order and returns how many there are. */
    int list(int[] into) {
      int count = 0;
      for (int w = 0; w < members.length; w++) {
        for (long bits = members[w]; bits != 0; bits &= bits - 1) {
          into[count++] = (w << 6) + Long.numberOfTrailingZeros(bits);
        }
      }
      return count;
    }

    private boolean member(int t) {
      return (members[t >>> 6] & (1L << t)) != 0;
    }

    private boolean selected(int t, Frame frame) {
      return selects(guards[t], frame);
    }
  }

  /** Whether one of a term's guards is 1 at the frame's state: the term is a member. */
  static boolean selects(Evaluator[] guards, Frame frame) {
    for (Evaluator guard : guards) {
      if (guard.eval(frame) != 0) {
        return true;
      }
    }
    return false;
  }
}
