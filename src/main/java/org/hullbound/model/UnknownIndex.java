package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;
import java.util.function.IntFunction;
import java.util.function.LongFunction;

/**
 * An index that reads unknowns ({@code mu[group_of[i]]} with {@code group_of[i]} a categorical
 * param, or {@code rate[phase[year]]} with the phase worked out from an unknown change year):
 * proves the whole numbers it can take and lowers the reference to a sum of indicators.
 *
 * <p>The proof is interval arithmetic on whole numbers: each unknown it reads must be whole-valued
 * with a finite support fixed by the data (bernoulli, binomial, categorical, whole-uniform, or a
 * discrete family cut by {@code within lo .. hi}); numbers must be whole; the operations are
 * {@code +}, {@code -}, {@code *}, {@code min} and {@code max}, which map whole numbers to whole
 * numbers and whose range over a box of arguments is reached at its corners. The binder then
 * checks the range against the indexed set, so an index can never fall outside it while sampling.
 *
 * <p>The lowered form of {@code name[index]} is {@code sum over v of name[v] * [index = v]} ({@link
 * Op#EQUAL}): every analysis sees an ordinary formula in which {@code name[v]} enters multiplied by
 * a factor free of it (affine, so the log-concavity and conjugacy rules apply unchanged), and the
 * compiled conditional of {@code name[v]} skips, draw by draw, the terms whose indicator is 0 at
 * the current allocation (docs/model-compilation.md, "Unknown indices").
 */
final class UnknownIndex {

  /** The whole numbers {@code lower .. upper}. */
  record Range(long lower, long upper) {
    long count() {
      return upper - lower + 1;
    }
  }

  /** The range an index can take, or why it cannot be proved; exactly one is not null. */
  record Proof(Range range, String problem) {
    static Proof of(Range range) {
      return new Proof(range, null);
    }

    static Proof refused(String problem) {
      return new Proof(null, problem);
    }
  }

  /** Whole numbers beyond this are refused, so that no product of corners overflows a long. */
  private static final long LIMIT = 1L << 30;

  private UnknownIndex() {}

  /**
   * The whole numbers {@code index} can take, given each slot's range ({@code null} for a slot that
   * is not a whole-valued unknown with a finite support; {@code slotNames} names it in a message).
   */
  static Proof range(Formula index, IntFunction<Range> slotRange, IntFunction<String> slotNames) {
    if (index instanceof Formula.Constant c) {
      double v = c.value();
      if (v != Math.rint(v) || Math.abs(v) > LIMIT) {
        return Proof.refused("it uses the number " + Binder.number(v)
            + ", and only whole numbers keep an index whole");
      }
      return Proof.of(new Range((long) v, (long) v));
    }
    if (index instanceof Formula.Slot slot) {
      Range range = slotRange.apply(slot.index());
      if (range == null) {
        return Proof.refused("it reads '" + slotNames.apply(slot.index()) + "', which is not a"
            + " whole-valued unknown with a finite support (categorical, whole-uniform, bernoulli,"
            + " binomial, or a count cut by within lo .. hi)");
      }
      if (Math.abs(range.lower()) > LIMIT || Math.abs(range.upper()) > LIMIT) {
        return Proof.refused("'" + slotNames.apply(slot.index()) + "' ranges over "
            + range.lower() + " .. " + range.upper() + ", too wide for an index");
      }
      return Proof.of(range);
    }
    Formula.Operation operation = (Formula.Operation) index;
    List<Range> parts = new ArrayList<>();
    for (Formula part : operation.parts()) {
      Proof proof = range(part, slotRange, slotNames);
      if (proof.problem() != null) {
        return proof;
      }
      parts.add(proof.range());
    }
    Range result;
    switch (operation.op()) {
      case ADD: {
        long lo = 0;
        long hi = 0;
        for (Range r : parts) {
          lo += r.lower();
          hi += r.upper();
        }
        result = new Range(lo, hi);
        break;
      }
      case SUBTRACT:
        result = new Range(parts.get(0).lower() - parts.get(1).upper(),
            parts.get(0).upper() - parts.get(1).lower());
        break;
      case NEGATE:
        result = new Range(-parts.get(0).upper(), -parts.get(0).lower());
        break;
      case MULTIPLY: {
        Range a = parts.get(0);
        Range b = parts.get(1);
        long[] corners = {a.lower() * b.lower(), a.lower() * b.upper(), a.upper() * b.lower(),
            a.upper() * b.upper()};
        long lo = corners[0];
        long hi = corners[0];
        for (long c : corners) {
          lo = Math.min(lo, c);
          hi = Math.max(hi, c);
        }
        result = new Range(lo, hi);
        break;
      }
      case MIN:
        result = new Range(Math.min(parts.get(0).lower(), parts.get(1).lower()),
            Math.min(parts.get(0).upper(), parts.get(1).upper()));
        break;
      case MAX:
        result = new Range(Math.max(parts.get(0).lower(), parts.get(1).lower()),
            Math.max(parts.get(0).upper(), parts.get(1).upper()));
        break;
      default:
        return Proof.refused("it uses '" + operation.op().symbol() + "'; an index that reads an"
            + " unknown may use +, -, *, min and max of whole numbers only");
    }
    if (Math.abs(result.lower()) > LIMIT || Math.abs(result.upper()) > LIMIT) {
      return Proof.refused("its range " + result.lower() + " .. " + result.upper()
          + " is too wide for an index");
    }
    return Proof.of(result);
  }

  /**
   * Several indexes of one name that read unknowns ({@code cell[r[i], c[i]]}), as one: {@code
   * index} is the code {@code sum of (index_j - lower_j) * stride_j} (row-major), over {@code
   * range} {@code 0 .. product of counts - 1}, and {@link #decode} gives back each index's value
   * (one index is itself, over its own range).
   * Lowered like one index, every option then has one indicator, so a term reading the name has
   * one guard per place, and the member form ({@link AllocationMembers#memberForm}) applies.
   */
  record Combined(Formula index, Range range, List<Range> parts) {
    long[] decode(long code) {
      if (parts.size() == 1) {
        return new long[] {code};
      }
      long[] values = new long[parts.size()];
      long rest = code;
      for (int j = parts.size() - 1; j >= 0; j--) {
        Range part = parts.get(j);
        values[j] = part.lower() + rest % part.count();
        rest /= part.count();
      }
      return values;
    }
  }

  /**
   * The indexes {@code indexes} (each proved to lie in {@code ranges}) as one {@link Combined}
   * index; {@code null} when their combinations together pass the limit of an index's range.
   */
  static Combined combine(List<Formula> indexes, List<Range> ranges) {
    if (indexes.size() == 1) {
      return new Combined(indexes.get(0), ranges.get(0), ranges);
    }
    long total = 1;
    for (Range r : ranges) {
      total *= r.count();
      if (total > LIMIT) {
        return null;
      }
    }
    List<Formula> terms = new ArrayList<>();
    long stride = total;
    for (int j = 0; j < indexes.size(); j++) {
      stride /= ranges.get(j).count();
      Formula offset = Formulas.apply(Op.SUBTRACT,
          List.of(indexes.get(j), Formula.constant(ranges.get(j).lower())));
      terms.add(stride == 1 ? offset
          : Formulas.apply(Op.MULTIPLY, List.of(offset, Formula.constant(stride))));
    }
    return new Combined(Formulas.apply(Op.ADD, terms), new Range(0, total - 1), ranges);
  }

  /**
   * {@code sum over v in range of option(v) * [index = v]}: the element the index picks, as a
   * formula that every analysis and the compiler read as they are; a single value is its option.
   */
  static Formula lower(Formula index, Range range, LongFunction<Formula> option) {
    if (range.count() == 1) {
      return option.apply(range.lower());
    }
    List<Formula> options = new ArrayList<>();
    for (long v = range.lower(); v <= range.upper(); v++) {
      Formula indicator = new Formula.Operation(Op.EQUAL, List.of(index, Formula.constant(v)));
      options.add(Formulas.apply(Op.MULTIPLY, List.of(option.apply(v), indicator)));
    }
    return Formulas.apply(Op.ADD, options);
  }

  /**
   * The indicators that guard every place term {@code t} reads slot {@code s}: each such place lies
   * in an option {@code [index = v] * (...)} whose indicator does not read {@code s}, so when all of
   * them are 0 the term is free of {@code s}. {@code null} when the term reads no unknown index, or
   * reads {@code s} somewhere unguarded (then it is always in the blanket).
   */
  static List<Formula> guards(Term t, int s) {
    List<Formula> found = new ArrayList<>();
    if (!collectGuards(t.value(), s, found)) {
      return null;
    }
    for (Formula a : t.arguments()) {
      if (!collectGuards(a, s, found)) {
        return null;
      }
    }
    return found.isEmpty() ? null : found;
  }

  private static boolean collectGuards(Formula f, int s, List<Formula> into) {
    if (!f.reads(s)) {
      return true;
    }
    if (!(f instanceof Formula.Operation operation)) {
      return false;
    }
    List<Formula> parts = operation.parts();
    if (operation.op() == Op.MULTIPLY) {
      for (int side = 0; side < 2; side++) {
        Formula factor = parts.get(side);
        if (factor instanceof Formula.Operation o && o.op() == Op.EQUAL && !factor.reads(s)) {
          into.add(factor);
          return true;
        }
      }
    }
    for (Formula part : parts) {
      if (!collectGuards(part, s, into)) {
        return false;
      }
    }
    return true;
  }

  /**
   * Whether slot {@code s} reaches term {@code t} through an unknown index only, so that its
   * blanket follows the allocation ({@link #guards}).
   */
  static boolean selects(Term t, int s) {
    return guards(t, s) != null;
  }

  /** Whether an unknown index of term {@code t} (an indicator's part) reads slot {@code s}. */
  static boolean indexedBy(Term t, int s) {
    if (indicatorReads(t.value(), s)) {
      return true;
    }
    for (Formula a : t.arguments()) {
      if (indicatorReads(a, s)) {
        return true;
      }
    }
    return false;
  }

  private static boolean indicatorReads(Formula f, int s) {
    if (f instanceof Formula.Operation operation) {
      if (operation.op() == Op.EQUAL) {
        return f.reads(s);
      }
      for (Formula part : operation.parts()) {
        if (indicatorReads(part, s)) {
          return true;
        }
      }
    }
    return false;
  }
}
