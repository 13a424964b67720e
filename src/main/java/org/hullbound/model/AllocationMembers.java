package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

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
  /** Per term: the guards that select it ({@link UnknownIndex#guards}), none if always in. */
  private final Guards guards;
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

  private AllocationMembers(int termCount, Guards guards, int[] inputs, List<int[]> guardReaders,
      List<int[]> partReaders, boolean[] wide) {
    this.termCount = termCount;
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
   * @param termCount how many terms the conditional's blanket has
   * @param slot the conditional's own unknown
   * @param inputs the other unknowns' slots the terms read, ascending
   * @param reads per term {@code t}, {@code reads[readStart[t] .. readStart[t + 1])}: the slots its
   *     form ({@link #memberForm}) reads
   * @param guardReads the same for the slots its guards read
   * @param guards every term's guards ({@link UnknownIndex#guards})
   */
  static AllocationMembers of(int termCount, int slot, int[] inputs, int[] readStart, int[] reads,
      int[] guardReadStart, int[] guardReads, Guards guards) {
    if (!guards.any()) {
      return null;
    }
    List<RowColumn.IntList> guardReaders = new ArrayList<>();
    List<RowColumn.IntList> partReaders = new ArrayList<>();
    for (int j = 0; j < inputs.length; j++) {
      guardReaders.add(new RowColumn.IntList());
      partReaders.add(new RowColumn.IntList());
    }
    for (int t = 0; t < termCount; t++) {
      addReader(reads, readStart[t], readStart[t + 1], slot, inputs, partReaders, t);
      addReader(guardReads, guardReadStart[t], guardReadStart[t + 1], slot, inputs, guardReaders,
          t);
    }
    boolean[] wide = new boolean[inputs.length];
    List<int[]> parts = new ArrayList<>();
    for (int j = 0; j < inputs.length; j++) {
      wide[j] = partReaders.get(j).size > Math.max(1, termCount / WIDE_SHARE);
      parts.add(wide[j] ? new int[0] : partReaders.get(j).toArray());
    }
    return new AllocationMembers(termCount, guards, inputs,
        guardReaders.stream().map(RowColumn.IntList::toArray).toList(), parts, wide);
  }

  /**
   * The guards of a blanket's terms: where every guard of a term is {@code [slot = v]} (an
   * allocation compared with an option, the common case) as pairs of primitive columns, with no
   * object per term; any other guard (an index that combines unknowns) compiled, per term.
   */
  static final class Guards {
    private final int[] start;
    private final int[] slots;
    private final double[] values;
    /** Per term, its compiled guards when they are not all {@code [slot = v]}; else null. */
    private final Evaluator[][] compiled;
    private final boolean any;

    private Guards(int[] start, int[] slots, double[] values, Evaluator[][] compiled, boolean any) {
      this.start = start;
      this.slots = slots;
      this.values = values;
      this.compiled = compiled;
      this.any = any;
    }

    boolean any() {
      return any;
    }

    /** Whether term {@code t} has guards (its membership follows an allocation). */
    boolean gated(int t) {
      return start[t + 1] > start[t] || compiled != null && compiled[t] != null;
    }

    /** Whether term {@code t} is selected at the frame's state: one of its guards is 1. */
    boolean selects(int t, Frame frame) {
      if (compiled != null && compiled[t] != null) {
        return AllocationMembers.selects(compiled[t], frame);
      }
      double[] state = frame.state;
      for (int k = start[t]; k < start[t + 1]; k++) {
        if (Op.EQUAL.binary(state[slots[k]], values[k]) != 0) {
          return true;
        }
      }
      return false;
    }

    /** Gathers the guards term by term, in blanket order. */
    static final class Builder {
      private final RowColumn.IntList start = new RowColumn.IntList();
      private final RowColumn.IntList slots = new RowColumn.IntList();
      private RowColumn.Doubles values = new RowColumn.Doubles();
      private java.util.Map<Integer, Evaluator[]> compiled;
      private boolean any;
      private int terms;

      Builder() {
        start.add(0);
      }

      /** Adds the next term's guards ({@link UnknownIndex#guards}: null for none). */
      void add(List<Formula> found) {
        if (found != null) {
          any = true;
          boolean simple = true;
          for (Formula g : found) {
            simple &= g instanceof Formula.Operation o && o.op() == Op.EQUAL
                && o.parts().get(0) instanceof Formula.Slot
                && o.parts().get(1) instanceof Formula.Constant;
          }
          if (simple) {
            for (Formula g : found) {
              List<Formula> parts = ((Formula.Operation) g).parts();
              slots.add(((Formula.Slot) parts.get(0)).index());
              values.add(((Formula.Constant) parts.get(1)).value());
            }
          } else {
            if (compiled == null) {
              compiled = new java.util.HashMap<>();
            }
            compiled.put(terms,
                found.stream().map(f -> Evaluator.compile(f, -1)).toArray(Evaluator[]::new));
          }
        }
        start.add(slots.size);
        terms++;
      }

      Guards build() {
        Evaluator[][] perTerm = null;
        if (compiled != null) {
          perTerm = new Evaluator[terms][];
          for (var e : compiled.entrySet()) {
            perTerm[e.getKey()] = e.getValue();
          }
        }
        int[] valueStart = start.toArray();
        values.finish();
        double[] held = new double[slots.size];
        for (int k = 0; k < held.length; k++) {
          held[k] = values.at(k);
        }
        return new Guards(valueStart, slots.toArray(), held, perTerm, any);
      }
    }
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

  private static void addReader(int[] read, int from, int to, int slot, int[] inputs,
      List<RowColumn.IntList> readers, int term) {
    for (int k = from; k < to; k++) {
      if (read[k] != slot) {
        readers.get(Arrays.binarySearch(inputs, read[k])).add(term);
      }
    }
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
          if (!guards.gated(t) || selected(t, frame)) {
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
      return guards.selects(t, frame);
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
