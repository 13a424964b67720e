package org.hullbound.model;

import java.util.AbstractList;
import java.util.Arrays;
import java.util.List;
import java.util.RandomAccess;

/**
 * The model's element-level terms in binding order, of which only the params' priors are held:
 * the term of a data row is made again from its statement and row whenever it is asked for.
 *
 * <p>Why: a term per data row, with its formula tree, costs about 230 bytes a row (issue 14), so a
 * file of 23 million rows could not be checked in the default heap; the data values those terms
 * read are held once anyway, in their columns. A term made again is equal to the one binding
 * checked (the same lowering of the same statement over the same data), so every analysis and
 * compilation that reads it sees what it saw when every term was held. Making one costs a
 * lowering of its statement for that row; reading terms is therefore for passes over a blanket,
 * not for a draw's inner loop (compiled conditionals hold their own evaluators).
 *
 * <p>Thread-safe: terms are made under a lock, as lowering shares its slot formulas.
 */
final class TermTable extends AbstractList<Term> implements RandomAccess {
  /** The nodes with a distribution, in binding order; term {@code starts[k] + e} is row e of k. */
  private final Node[] nodes;
  private final int[] starts;
  /** The held terms of each node (its priors), or {@code null} where they are made again. */
  private final Term[][] held;
  private final TermBinding binding;
  private final int size;
  /** Each node's statement formula once asked, {@link #NO_STATEMENT} where it has none. */
  private final java.util.concurrent.atomic.AtomicReferenceArray<Object> statements;

  private TermTable(Node[] nodes, int[] starts, Term[][] held, TermBinding binding) {
    this.nodes = nodes;
    this.starts = starts;
    this.held = held;
    this.binding = binding;
    this.size = starts[nodes.length];
    this.statements = new java.util.concurrent.atomic.AtomicReferenceArray<>(nodes.length);
  }

  /**
   * The terms of {@code nodes} (each a node with a distribution, in binding order), holding
   * those of params and making those of data again through {@code binding}, which must have
   * checked every one of them already.
   */
  static TermTable of(List<Node> nodes, TermBinding binding) {
    Node[] array = nodes.toArray(new Node[0]);
    int[] starts = new int[array.length + 1];
    Term[][] held = new Term[array.length][];
    for (int k = 0; k < array.length; k++) {
      starts[k + 1] = Math.addExact(starts[k], array[k].size);
      if (array[k].kind == Node.Kind.PARAM) {
        held[k] = new Term[array[k].size];
        for (int e = 0; e < array[k].size; e++) {
          held[k][e] = binding.madeAgain(array[k], e);
        }
      }
    }
    return new TermTable(array, starts, held, binding);
  }

  @Override
  public Term get(int index) {
    int k = node(index);
    int e = index - starts[k];
    if (held[k] != null) {
      return held[k][e];
    }
    synchronized (binding) {
      return binding.madeAgain(nodes[k], e);
    }
  }

  /**
   * Term {@code index} lowered from its statement's syntax for its row, as binding made it: what
   * {@link #get} must equal (for tests of {@link StatementFormula}).
   */
  Term lowered(int index) {
    int k = node(index);
    synchronized (binding) {
      return binding.lowered(nodes[k], index - starts[k]);
    }
  }

  /** How many terms were made by lowering their statement for their row, binding's included. */
  long rowLowerings() {
    synchronized (binding) {
      return binding.rowLowerings();
    }
  }

  /** How many let elements were lowered one by one from their let's syntax, binding's included. */
  long letLowerings() {
    synchronized (binding) {
      return binding.letLowerings();
    }
  }

  /**
   * The indexes among {@code indexes} (increasing) of terms whose statement does not answer
   * {@code answered} for all its rows at once ({@link StatementFormula}): the terms a pass must
   * still read one by one. The params' priors are always among them.
   */
  int[] unanswered(int[] indexes, java.util.function.Predicate<StatementFormula> answered) {
    int[] kept = new int[indexes.length];
    int count = 0;
    int k = -1;
    boolean skip = false;
    for (int index : indexes) {
      if (k < 0 || index >= starts[k + 1]) {
        k = node(index);
        StatementFormula statement = statementOfNode(k);
        skip = statement != null && answered.test(statement);
      }
      if (!skip) {
        kept[count++] = index;
      }
    }
    return count == indexes.length ? indexes : Arrays.copyOf(kept, count);
  }

  /** The statement formula term {@code index} is a row of, or {@code null} (a held prior). */
  StatementFormula statementOf(int index) {
    return statementOfNode(node(index));
  }

  /**
   * The statement formula of node {@code k}, or {@code null}; looked up under the lock once per
   * node and then read without it, as the analyses ask for every row of millions.
   */
  private StatementFormula statementOfNode(int k) {
    Object found = statements.get(k);
    if (found == null) {
      synchronized (binding) {
        StatementFormula made = held[k] != null ? null : binding.statement(nodes[k]);
        found = made == null ? NO_STATEMENT : made;
      }
      statements.set(k, found);
    }
    return found == NO_STATEMENT ? null : (StatementFormula) found;
  }

  /** In {@link #statements}: the node has no statement formula. */
  private static final Object NO_STATEMENT = new Object();

  /** The index after the last term of the node of term {@code index}. */
  int nodeEnd(int index) {
    return starts[node(index) + 1];
  }

  /** The row (element) of term {@code index} within its node. */
  int rowOf(int index) {
    return index - starts[node(index)];
  }

  /** The node of term {@code index}. */
  private int node(int index) {
    NodeRange range = lastRange;
    if (index >= range.start() && index < range.end()) {
      // a pass reads a node's rows one after the other: no search for each
      return range.node();
    }
    if (index < 0 || index >= size) {
      throw new IndexOutOfBoundsException("index must be in 0 .. " + (size - 1) + ", got " + index);
    }
    int k = Arrays.binarySearch(starts, index);
    // the node whose first term is at or before index; empty nodes share a start with the next
    k = k >= 0 ? k : -k - 2;
    while (starts[k + 1] == index) {
      k++;
    }
    lastRange = new NodeRange(k, starts[k], starts[k + 1]);
    return k;
  }

  /** The terms {@code start .. end - 1} of node {@code node}: the last one {@link #node} found. */
  private record NodeRange(int node, int start, int end) {}

  /** Read and replaced by any thread: a range is immutable, and any one of them is right. */
  private volatile NodeRange lastRange = new NodeRange(-1, 0, 0);

  @Override
  public int size() {
    return size;
  }

  /**
   * The terms at {@code indexes} of {@code terms}, each read when asked: a pass over an
   * unknown's blanket then holds one data row's term at a time.
   */
  static List<Term> at(List<Term> terms, int[] indexes) {
    return new Selected(terms, indexes);
  }

  /**
   * A list of terms that can say, for each, the statement formula it is a row of: an analysis may
   * then answer a row from its statement without making the row's term ({@link StatementFormula}).
   */
  interface Rows {
    /** The statement formula of term {@code k} of the list, or {@code null} (a prior, say). */
    StatementFormula statement(int k);

    /** The row (element) of term {@code k} within its statement. */
    int row(int k);

    /**
     * The end (exclusive) of the run of terms from {@code k} on that are rows of the same node
     * as term {@code k}: a pass that answers them all from their statement skips to it.
     */
    default int runEnd(int k) {
      return k + 1;
    }
  }

  private static final class Selected extends AbstractList<Term> implements RandomAccess, Rows {
    private final List<Term> terms;
    private final int[] indexes;

    Selected(List<Term> terms, int[] indexes) {
      this.terms = terms;
      this.indexes = indexes;
    }

    @Override
    public StatementFormula statement(int k) {
      return terms instanceof TermTable table ? table.statementOf(indexes[k]) : null;
    }

    @Override
    public int row(int k) {
      return terms instanceof TermTable table ? table.rowOf(indexes[k]) : -1;
    }

    @Override
    public int runEnd(int k) {
      if (!(terms instanceof TermTable table)) {
        return k + 1;
      }
      // the indexes increase: the first one past the node's last term ends the run
      int end = table.nodeEnd(indexes[k]);
      int found = Arrays.binarySearch(indexes, k + 1, indexes.length, end);
      return found >= 0 ? found : -found - 1;
    }

    @Override
    public Term get(int k) {
      return terms.get(indexes[k]);
    }

    @Override
    public int size() {
      return indexes.length;
    }
  }

  /** How many terms are held as objects (the params' priors); the others are made when asked. */
  int heldCount() {
    int count = 0;
    for (Term[] terms : held) {
      count += terms == null ? 0 : terms.length;
    }
    return count;
  }
}
