package org.hullbound.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import org.hullbound.model.family.Curvature;
import org.hullbound.model.family.Scale;
import org.hullbound.model.family.SupportKind;

/**
 * Recognises, from the model's structure, the moves along lines that the Gibbs driver adds after
 * its one-at-a-time updates, and proves (or not) that each line's density is log-concave.
 *
 * <ul>
 *   <li><b>Shift</b> (Liu and Sabatti 2000, translation group): a real scalar unknown {@code a}
 *       and a group of real effects {@code e[1..K]} such that every term reading one of them
 *       (but their own priors) reads both, in a way that {@code a + d}, {@code e[k] - d} leaves
 *       unchanged, as {@code alpha + effect[group[i]]} in a linear predictor does. Only the priors
 *       of {@code a} and the effects move along the line.
 *   <li><b>Rescale</b> (their scale group): a positive scalar {@code s} read only by the priors
 *       {@code e[k] ~ normal(mean = m, sd = b * s)} of a group of real effects, {@code m} the
 *       constant 0 or a real unknown outside the group. Along {@code c -> (c s, m + c (e - m))}
 *       each such prior is {@code -log c} plus a constant, which cancels against {@code K} of the
 *       {@code d - 1 = K} powers of {@code c} that the Jacobian {@code c^d} and Haar measure
 *       {@code dc / c} give. (A rescaling about the effects' own mean, the shift's lead taking up
 *       the difference, was tried and left out: per CPU-second it did not pay for its evaluation
 *       of every row, see docs/fit.md.)
 *   <li><b>Direction block</b>: real scalar (or small vector) unknowns that enter one argument of
 *       the same terms together, not already drawn jointly as a linear-normal block nor effects
 *       of a shift or rescaling (whose ridge that move handles): drawn along directions learned
 *       during burn-in.
 * </ul>
 *
 * <p>The proof along a line substitutes {@code x_j + t w_j} (or {@code c x_j}) for each moved
 * unknown and applies the rules of {@link UpdateAnalysis} in {@code t}: every moved term must
 * have one moving part, affine in {@code t} (or the exp or expit of an affine function), with the
 * family concave in it; a sum of concave functions is concave. A linear predictor jointly affine
 * in the moved unknowns is affine along every line through them.
 */
final class MovePatterns {
  /** Vector unknowns of at most this many elements may join a direction block. */
  static final int LARGEST_BLOCK_NODE = 6;

  /** Direction blocks of more unknowns than this are not formed. */
  static final int LARGEST_BLOCK = 8;

  /** What the finder reads of a bound model. */
  record Facts(List<Term> terms, int[] ownTerm, int[][] dependents, List<Unknown> unknowns,
      Update[] updates, ArgumentBounds[] cuts, boolean[] smooth) {}

  private record Verdict(boolean concave, String reason) {}

  private MovePatterns() {}

  /** Every move found, shifts and rescalings first, then direction blocks. */
  static List<Update> find(Facts f) {
    Map<String, List<Integer>> nodes = new LinkedHashMap<>();
    for (Unknown u : f.unknowns()) {
      if (!u.imputed()) {
        nodes.computeIfAbsent(u.node(), k -> new ArrayList<>()).add(u.index());
      }
    }
    List<Update> moves = new ArrayList<>();
    for (List<Integer> group : nodes.values()) {
      if (group.size() < 2 || !group.stream().allMatch(j -> real(f, j))) {
        continue;
      }
      for (List<Integer> scalar : nodes.values()) {
        if (scalar.size() != 1) {
          continue;
        }
        int j = scalar.get(0);
        Update move = real(f, j) ? shift(f, j, group) : positive(f, j) ? rescale(f, j, group)
            : null;
        if (move != null) {
          moves.add(move);
        }
      }
    }
    boolean[] grouped = new boolean[f.unknowns().size()];
    for (Update move : moves) {
      int[] members = ((Update.GroupMove) move).members();
      for (int k = 1; k < members.length; k++) {
        grouped[members[k]] = true;
      }
    }
    moves.addAll(directionBlocks(f, nodes, grouped));
    return moves;
  }

  /** A continuous parameter on the whole real line whose support nothing cuts. */
  private static boolean real(Facts f, int j) {
    Unknown u = f.unknowns().get(j);
    return !u.discrete() && !u.imputed() && u.lower() == Double.NEGATIVE_INFINITY
        && u.upper() == Double.POSITIVE_INFINITY && f.cuts()[j].none();
  }

  private static boolean positive(Facts f, int j) {
    Unknown u = f.unknowns().get(j);
    return !u.discrete() && !u.imputed() && u.lower() == 0
        && u.upper() == Double.POSITIVE_INFINITY && f.cuts()[j].none()
        && f.terms().get(f.ownTerm()[j]).family().support() == SupportKind.POSITIVE;
  }

  private static Update shift(Facts f, int lead, List<Integer> group) {
    Set<Integer> ownOfGroup = ownTerms(f, group);
    // Bit sets, not sets of boxed indexes: the terms that read the lead may be every data row.
    java.util.BitSet readingLead = new java.util.BitSet();
    for (int t : f.dependents()[lead]) {
      if (!ownOfGroup.contains(t)) {
        readingLead.set(t);
      }
    }
    if (readingLead.isEmpty()) {
      return null;
    }
    java.util.BitSet readingGroup = new java.util.BitSet();
    for (int e : group) {
      for (int t : f.dependents()[e]) {
        if (!ownOfGroup.contains(t) && t != f.ownTerm()[lead]) {
          readingGroup.set(t);
        }
      }
    }
    if (!readingLead.equals(readingGroup)) {
      return null;
    }
    int n = f.unknowns().size();
    int[] members = prepend(lead, group);
    double[] weights = new double[members.length];
    Map<Integer, Formula> replace = new LinkedHashMap<>();
    for (int k = 0; k < members.length; k++) {
      weights[k] = k == 0 ? 1 : -1;
      replace.put(members[k], Formulas.apply(Op.ADD, List.of(new Formula.Slot(members[k]),
          Formulas.apply(Op.MULTIPLY, List.of(Formula.constant(weights[k]),
              new Formula.Slot(n))))));
    }
    int[] weightOf = new int[n];
    for (int k = 0; k < members.length; k++) {
      weightOf[members[k]] = (int) weights[k];
    }
    TermTable table = f.terms() instanceof TermTable tt ? tt : null;
    for (int t = readingLead.nextSetBit(0); t >= 0; t = readingLead.nextSetBit(t + 1)) {
      StatementFormula statement = table == null ? null : table.statementOf(t);
      if (statement != null && statement.affineInEveryUnknown()) {
        // answered from the row's indexes where the moved unknowns enter with slope +1 or -1
        int answer = statement.unchangedWhenShifted(table.rowOf(t), weightOf);
        if (answer == 0) {
          return null;
        }
        if (answer == 1) {
          continue;
        }
      }
      if (!unchanged(substitute(f.terms().get(t), replace), n)) {
        return null;
      }
    }
    List<Term> moved = new ArrayList<>();
    for (int j : members) {
      moved.add(substitute(f.terms().get(f.ownTerm()[j]), replace));
    }
    Verdict proof = prove(moved, n, 0);
    String lead0 = label(f, lead);
    String groupName = f.unknowns().get(group.get(0)).node();
    String reason = "shift " + lead0 + " + d, every " + groupName + " - d: each of the "
        + readingLead.cardinality() + " terms that read them reads " + lead0 + " + " + groupName
        + "[..] and stays unchanged, so only the " + members.length + " priors move"
        + " (generalised Gibbs, Liu and Sabatti 2000, translation group, Jacobian 1); "
        + proof.reason();
    return new Update.GroupMove(Update.MoveKind.SHIFT, reason, proof.concave(),
        new LineDensity(n, members, weights, LineDensity.Geometry.FIXED_TRANSLATION,
            moved.size(), constant(moved), smooth(f, members)));
  }

  private static Update rescale(Facts f, int scale, List<Integer> group) {
    Set<Integer> ownOfGroup = ownTerms(f, group);
    Set<Integer> readingScale = new TreeSet<>();
    for (int t : f.dependents()[scale]) {
      readingScale.add(t);
    }
    if (!readingScale.equals(ownOfGroup)) {
      return null;
    }
    // the effects' common prior mean: 0 (-1 here), or a real scalar unknown that nothing moves
    int location = -2;
    for (int e : group) {
      Term own = f.terms().get(f.ownTerm()[e]);
      Formulas.Monomial sd = own.argument("sd") == null ? null
          : Formulas.monomial(own.argument("sd"), scale);
      int at = location(f, own.argument("mean"), scale, group);
      if (!own.familyName().equals("normal") || own.truncated()
          || !(own.value() instanceof Formula.Slot)
          || at == -2 || (location != -2 && at != location)
          || sd == null || sd.power() != 1
          || !(sd.coefficient() instanceof Formula.Constant b && b.value() > 0)) {
        return null;
      }
      location = at;
    }
    int n = f.unknowns().size();
    int[] members = prepend(scale, group);
    Map<Integer, Formula> replace = new LinkedHashMap<>();
    for (int k = 0; k < members.length; k++) {
      Formula slot = new Formula.Slot(members[k]);
      Formula c = new Formula.Slot(n);
      // about a location m: m + c (e - m), so that e - m, what the prior reads, is times c
      replace.put(members[k], k == 0 || location < 0
          ? Formulas.apply(Op.MULTIPLY, List.of(slot, c))
          : Formulas.apply(Op.ADD, List.of(new Formula.Slot(location), Formulas.apply(
              Op.MULTIPLY, List.of(c, Formulas.apply(Op.SUBTRACT,
                  List.of(slot, new Formula.Slot(location))))))));
    }
    List<Term> moved = movedTerms(f, members, replace);
    Verdict proof = prove(moved, n, members.length - 1);
    String groupName = f.unknowns().get(group.get(0)).node();
    String mean = location < 0 ? "0" : label(f, location);
    String reason = "rescale " + label(f, scale) + " and every " + groupName + " by c > 0"
        + (location < 0 ? "" : " about " + mean + " (" + mean + " + c (" + groupName
            + "[..] - " + mean + "))") + ": the " + group.size() + " effects have normal(mean = "
        + mean + ", sd = " + label(f, scale)
        + ") priors (generalised Gibbs, Liu and Sabatti 2000, scale group: c drawn from c^"
        + group.size() + (location < 0 ? " p(c x)" : " p(g_c x)") + ", the Jacobian c^"
        + members.length + " times the Haar measure dc / c); " + (location < 0 ? proof.reason()
            : proof.reason().replace("with mean 0 and value and sd both times c",
                "whose value less their mean " + mean + " and sd are both times c"));
    return new Update.GroupMove(Update.MoveKind.RESCALE, reason, proof.concave(),
        LineDensity.rescaling(n, members, location < 0 ? LineDensity.Geometry.RESCALING
                : LineDensity.Geometry.RESCALING_ABOUT_LOCATION, location, group.size(),
            moved.size() - group.size(), toCompile(f, members, replace, group),
            smooth(f, members)));
  }

  /**
   * What an effect's prior mean lets a rescaling turn about: -1 for the constant 0, the index of
   * a real scalar unknown outside the move ({@code effect[k] ~ normal(mean = centre, ...)}: the
   * effects rescale about it, which stays), -2 for anything else.
   */
  private static int location(Facts f, Formula mean, int scale, List<Integer> group) {
    if (mean instanceof Formula.Constant c && c.value() == 0) {
      return -1;
    }
    if (mean instanceof Formula.Slot slot && slot.index() != scale
        && !group.contains(slot.index()) && real(f, slot.index())) {
      return slot.index();
    }
    return -2;
  }

  /**
   * Blocks of unknowns outside the groups of effects that a shift or rescaling moves ({@code
   * grouped}), whose ridge that move handles; the intercept or scale of such a move may join.
   */
  private static List<Update> directionBlocks(
      Facts f, Map<String, List<Integer>> nodes, boolean[] grouped) {
    int n = f.unknowns().size();
    int[] root = new int[n];
    boolean[] candidate = new boolean[n];
    for (List<Integer> node : nodes.values()) {
      for (int j : node) {
        root[j] = j;
        candidate[j] = node.size() <= LARGEST_BLOCK_NODE && real(f, j) && !grouped[j]
            && !(f.updates()[j] instanceof Update.LinearNormalBlock);
      }
    }
    Set<Integer> read = new LinkedHashSet<>();
    int[] slots = new int[4];
    for (int j = 0; j < n; j++) {
      if (!candidate[j]) {
        continue;
      }
      for (int t : f.dependents()[j]) {
        StatementFormula statement =
            f.terms() instanceof TermTable table ? table.statementOf(t) : null;
        if (statement != null && statement.affineInEveryUnknown()) {
          // the slots each argument of the row reads, from its indexes, with no term made
          int row = ((TermTable) f.terms()).rowOf(t);
          for (int k = 0; k < statement.family().argumentNames().size(); k++) {
            slots = statement.argumentSlots(row, k, slots);
            int count = statement.argumentSlotCount(k);
            boolean readsJ = false;
            for (int i = 0; i < count; i++) {
              readsJ |= slots[i] == j;
            }
            if (readsJ) {
              for (int i = 0; i < count; i++) {
                int other = slots[i];
                if (other != j && candidate[other]) {
                  root[find(root, other)] = find(root, j);
                }
              }
            }
          }
          continue;
        }
        for (Formula argument : f.terms().get(t).arguments()) {
          if (!argument.reads(j)) {
            continue;
          }
          read.clear();
          argument.collectSlots(read);
          for (int other : read) {
            if (other != j && candidate[other]) {
              root[find(root, other)] = find(root, j);
            }
          }
        }
      }
    }
    Map<Integer, List<Integer>> blocks = new LinkedHashMap<>();
    for (int j = 0; j < n; j++) {
      if (candidate[j]) {
        blocks.computeIfAbsent(find(root, j), k -> new ArrayList<>()).add(j);
      }
    }
    List<Update> found = new ArrayList<>();
    for (List<Integer> block : blocks.values()) {
      if (block.size() < 2 || block.size() > LARGEST_BLOCK) {
        continue;
      }
      int[] members = block.stream().mapToInt(Integer::intValue).toArray();
      Map<Integer, Formula> replace = new LinkedHashMap<>();
      for (int k = 0; k < members.length; k++) {
        replace.put(members[k], Formulas.apply(Op.ADD, List.of(new Formula.Slot(members[k]),
            Formulas.apply(Op.MULTIPLY, List.of(new Formula.Slot(n + 1 + k),
                new Formula.Slot(n))))));
      }
      List<Term> moved = movedTerms(f, members, replace);
      Verdict proof = prove(moved, n, 0);
      List<String> names = new ArrayList<>();
      for (int j : members) {
        names.add(label(f, j));
      }
      String reason = String.join(", ", names) + " enter the same " + (moved.size()
          - members.length) + " terms together: drawn along the eigenvectors of their burn-in"
          + " covariance, fixed after burn-in (hit-and-run with fixed directions, Belisle,"
          + " Romeijn and Smith 1993); " + proof.reason();
      found.add(new Update.DirectionBlock(reason, proof.concave(),
          new LineDensity(n, members, null, LineDensity.Geometry.LEARNED_TRANSLATION,
              moved.size(), toCompile(f, members, replace), smooth(f, members))));
    }
    return found;
  }

  /** The few moved terms of a shift (the members' priors), held as they are. */
  private static java.util.function.Supplier<List<Term>> constant(List<Term> moved) {
    List<Term> held = List.copyOf(moved);
    return () -> held;
  }

  /** The moved terms, made again when the line compiles, each when the compiler reads it. */
  private static java.util.function.Supplier<List<Term>> toCompile(
      Facts f, int[] members, Map<Integer, Formula> replace) {
    return toCompile(f, members, replace, List.of());
  }

  /**
   * The same, without the own terms of {@code scaleFree}: the effects of a rescaling, whose
   * normal priors are {@code -log c} plus a constant along the line ({@link #scaleFree}). Their
   * {@code -log c} cancels as many powers of {@code c} of the Jacobian ({@link
   * LineDensity#rescaling}); left in, the two would be added as large terms of opposite sign near
   * {@code c = 0} ({@code K / c} in the slope), which rounding turned into slopes off by 60 at
   * {@code c = 1e-8} on {@code seedlings}, enough for the hull to see a density that is not
   * log-concave. Left out, an evaluation also sums {@code K} terms fewer.
   */
  private static java.util.function.Supplier<List<Term>> toCompile(
      Facts f, int[] members, Map<Integer, Formula> replace, List<Integer> scaleFree) {
    java.util.BitSet left = new java.util.BitSet();
    for (int e : scaleFree) {
      left.set(f.ownTerm()[e]);
    }
    // Made when read, not copied: the compiler reads each term once, and a line through every
    // row (a rescaling of effects that every row reads) would hold a moved term per row.
    return () -> movedTerms(f, members, replace, left);
  }

  /**
   * The own and dependent terms of {@code members}, each once, with the line substituted; the
   * same list on every call, so a line may make it again when it compiles ({@link LineDensity}).
   */
  private static List<Term> movedTerms(Facts f, int[] members, Map<Integer, Formula> replace) {
    return movedTerms(f, members, replace, new java.util.BitSet());
  }

  /** The same, without the terms in {@code left}. */
  private static List<Term> movedTerms(
      Facts f, int[] members, Map<Integer, Formula> replace, java.util.BitSet left) {
    java.util.BitSet touched = new java.util.BitSet(f.terms().size());
    for (int j : members) {
      touched.set(f.ownTerm()[j]);
      for (int t : f.dependents()[j]) {
        touched.set(t);
      }
    }
    touched.andNot(left);
    // Made when read, one at a time: a line through every row's term would otherwise hold a
    // moved term per row (TermTable).
    List<Term> terms = TermTable.at(f.terms(), touched.stream().toArray());
    return new Moved(terms, replace);
  }

  /**
   * The moved terms of a line, each made when read; a row's statement is its term's ({@link
   * TermTable.Rows}), so that {@link #prove} may answer the row from it.
   */
  private static final class Moved extends java.util.AbstractList<Term>
      implements TermTable.Rows {
    private final List<Term> terms;
    private final Map<Integer, Formula> replace;

    /** Per slot, whether it moves (the keys of {@code replace}), read for every row's leaves. */
    private final boolean[] moving;

    Moved(List<Term> terms, Map<Integer, Formula> replace) {
      this.terms = terms;
      this.replace = replace;
      int largest = -1;
      for (int j : replace.keySet()) {
        largest = Math.max(largest, j);
      }
      this.moving = new boolean[largest + 1];
      for (int j : replace.keySet()) {
        moving[j] = true;
      }
    }

    @Override
    public StatementFormula statement(int k) {
      return terms instanceof TermTable.Rows rows ? rows.statement(k) : null;
    }

    @Override
    public int row(int k) {
      return ((TermTable.Rows) terms).row(k);
    }

    @Override
    public int runEnd(int k) {
      return terms instanceof TermTable.Rows rows ? rows.runEnd(k) : k + 1;
    }

    /** Whether slot {@code j} moves along the line. */
    boolean moves(int j) {
      return j >= 0 && j < moving.length && moving[j];
    }

    @Override
    public Term get(int k) {
      return substitute(terms.get(k), replace);
    }

    @Override
    public int size() {
      return terms.size();
    }
  }

  private static int find(int[] root, int j) {
    while (root[j] != j) {
      root[j] = root[root[j]];
      j = root[j];
    }
    return j;
  }

  /**
   * Whether the line's density is log-concave in its position {@code t} (slot {@code n}), with
   * the proof or the first term that defeats it; {@code scalePowers} is {@code d - 1} for a
   * rescaling of {@code d} unknowns (the Jacobian and Haar factor {@code c^(d - 1)}), else 0.
   */
  private static Verdict prove(List<Term> moved, int n, int scalePowers) {
    Set<String> pieces = new LinkedHashSet<>();
    int scaleFree = 0;
    Moved rows = moved instanceof Moved m ? m : null;
    java.util.function.IntPredicate moves = rows == null ? null : rows::moves;
    StatementFormula lastStatement = null;
    int onlyArgument = StatementFormula.READ_THE_TERM;
    Object lastPiece = null;
    StatementFormula.ArgumentAnswers answered = new StatementFormula.ArgumentAnswers();
    for (int i = 0; i < moved.size(); i++) {
      StatementFormula statement = rows == null ? null : rows.statement(i);
      if (statement != null && statement.affineInEveryUnknown()) {
        // A data row whose arguments are affine in their params: its value moves with no
        // unknown (so it is not scale-free), and an argument that reads a moved unknown stays
        // affine along the line, as every line here moves each unknown affinely in t; the row
        // says only which arguments move.
        // every row here reads a moved unknown, through its arguments where its value is data:
        // one argument alone that can read one is then the row's, with no row looked at
        if (statement != lastStatement) {
          lastStatement = statement;
          onlyArgument = statement.everyRowObserved() ? statement.onlyArgumentReading(moves)
              : StatementFormula.READ_THE_TERM;
        }
        int k = onlyArgument >= 0 ? onlyArgument : statement.movingArgument(rows.row(i), moves);
        if (k == StatementFormula.NO_ARGUMENT) {
          continue;
        }
        Object answer = k < 0 ? null : answered.of(statement, k, MovePatterns::affinePiece);
        if (answer instanceof Verdict failed) {
          return failed;
        }
        if (answer != null) {
          if (answer != lastPiece) {
            pieces.add((String) answer);
            lastPiece = answer;
          }
          if (onlyArgument >= 0) {
            // the statement's answer holds for each of its rows here: past them at once
            i = rows.runEnd(i) - 1;
          }
          continue;
        }
      }
      Term t = moved.get(i);
      if (scalePowers > 0 && scaleFree(t, n)) {
        scaleFree++;
        continue;
      }
      List<Integer> moving = new ArrayList<>();
      if (t.value().reads(n)) {
        moving.add(-1);
      }
      for (int k = 0; k < t.arguments().size(); k++) {
        if (t.arguments().get(k).reads(n)) {
          moving.add(k);
        }
      }
      if (moving.isEmpty()) {
        continue;
      }
      String where = t.familyName() + " term " + t.label();
      if (moving.size() > 1) {
        return new Verdict(false, "not provably log-concave along the line: it moves more than"
            + " one argument of " + where);
      }
      int k = moving.get(0);
      if (t.truncated() && k >= 0) {
        return new Verdict(false, "not provably log-concave along the line: " + where
            + " is truncated and its normaliser moves");
      }
      Formula part = k < 0 ? t.value() : t.arguments().get(k);
      String name = k < 0 ? "the value" : t.argumentName(k);
      Scale scale = null;
      String link = null;
      if (Formulas.affine(part, n)) {
        scale = Scale.NATURAL;
        link = "affine along the line (jointly affine in the moved unknowns)";
      } else if (k >= 0 && Formulas.unwrap(part, Op.EXP) != null
          && Formulas.affine(Formulas.unwrap(part, Op.EXP), n)) {
        scale = Scale.LOG;
        link = "exp of an affine function along the line";
      } else if (k >= 0 && Formulas.unwrap(part, Op.EXPIT) != null
          && Formulas.affine(Formulas.unwrap(part, Op.EXPIT), n)) {
        scale = Scale.LOGIT;
        link = "expit of an affine function along the line";
      }
      if (scale == null) {
        return new Verdict(false, "not provably log-concave along the line: " + name + " of "
            + where + " is not affine along it");
      }
      Curvature c = k < 0 ? t.family().curvatureInValue(Scale.NATURAL, t.knownArguments())
          : t.family().curvatureInArgument(k, scale, t.knownArguments());
      if (!c.concave()) {
        return new Verdict(false, "not provably log-concave along the line: " + t.familyName()
            + " is not concave in " + name + " (" + c.reason() + ")");
      }
      pieces.add(t.familyName() + (k < 0 ? " priors" : " terms") + " concave in " + name + ", "
          + link);
    }
    StringBuilder proof = new StringBuilder("log-concave along the line: ");
    proof.append(String.join("; ", pieces));
    if (scalePowers > 0) {
      if (scaleFree > scalePowers) {
        return new Verdict(false, "not provably log-concave along the line: " + scaleFree
            + " scale-free priors give -" + scaleFree + " log c, more than the " + scalePowers
            + " log c of the Jacobian");
      }
      proof.append("; the ").append(scaleFree).append(" normal priors with mean 0 and value and")
          .append(" sd both times c are -log c each, which cancels ").append(scaleFree)
          .append(" of the ").append(scalePowers).append(" log c of the Jacobian")
          .append(scaleFree == scalePowers ? "" : "; the rest, a positive multiple of log c, is"
              + " concave");
    }
    return new Verdict(true, proof.toString());
  }

  /**
   * The piece of a line's proof that a term of {@code family} gives when its argument {@code k}
   * alone moves, affinely, and no argument is known, or the verdict that defeats it: the words of
   * the term-by-term rule in {@link #prove}.
   */
  private static Object affinePiece(org.hullbound.model.family.Parametrisation family, int k) {
    double[] known = new double[family.argumentNames().size()];
    java.util.Arrays.fill(known, Double.NaN);
    String familyName = family.family().name();
    String name = family.argumentNames().get(k);
    Curvature c = family.curvatureInArgument(k, Scale.NATURAL, known);
    if (!c.concave()) {
      return new Verdict(false, "not provably log-concave along the line: " + familyName
          + " is not concave in " + name + " (" + c.reason() + ")");
    }
    return familyName + " terms concave in " + name + ", "
        + "affine along the line (jointly affine in the moved unknowns)";
  }

  /**
   * {@code c y ~ normal(mean = 0 or c m, sd = c s)}, or {@code m + c y ~ normal(mean = m, sd = c
   * s)} with {@code m} fixed along the line: {@code -log c} plus a constant in c.
   */
  private static boolean scaleFree(Term t, int n) {
    if (!t.familyName().equals("normal") || t.truncated() || t.argument("sd") == null
        || !proportional(t.argument("sd"), n)) {
      return false;
    }
    Formula mean = t.argument("mean");
    if (mean.reads(n)) {
      return proportional(mean, n) && proportional(t.value(), n);
    }
    if (mean instanceof Formula.Constant c && c.value() == 0) {
      return proportional(t.value(), n);
    }
    return t.value() instanceof Formula.Operation sum && sum.op() == Op.ADD
        && sum.parts().size() == 2 && sum.parts().get(0).equals(mean)
        && proportional(sum.parts().get(1), n);
  }

  private static boolean proportional(Formula f, int n) {
    Formulas.Monomial m = Formulas.monomial(f, n);
    return m != null && m.power() == 1;
  }

  /** True when neither the value nor any argument of {@code t} moves along the line. */
  private static boolean unchanged(Term t, int n) {
    List<Formula> parts = new ArrayList<>(t.arguments());
    parts.add(t.value());
    for (Formula part : parts) {
      if (!part.reads(n)) {
        continue;
      }
      Formula[] affine = Formulas.affineParts(part, n);
      if (affine == null || !(affine[1] instanceof Formula.Constant c && c.value() == 0)) {
        return false;
      }
    }
    return true;
  }

  private static Term substitute(Term t, Map<Integer, Formula> replace) {
    List<Formula> arguments = new ArrayList<>();
    for (Formula a : t.arguments()) {
      arguments.add(substitute(a, replace));
    }
    return new Term(t.names(), t.element(), t.cells(), t.family(),
        substitute(t.value(), replace), arguments, t.within(), t.owner(), t.position());
  }

  private static Formula substitute(Formula f, Map<Integer, Formula> replace) {
    if (f instanceof Formula.Slot slot) {
      return replace.getOrDefault(slot.index(), f);
    }
    if (f instanceof Formula.Operation o) {
      List<Formula> parts = new ArrayList<>();
      boolean same = true;
      for (Formula part : o.parts()) {
        Formula p = substitute(part, replace);
        same &= p == part;
        parts.add(p);
      }
      return same ? f : Formulas.apply(o.op(), parts);
    }
    return f;
  }

  private static Set<Integer> ownTerms(Facts f, List<Integer> group) {
    Set<Integer> own = new TreeSet<>();
    for (int e : group) {
      own.add(f.ownTerm()[e]);
    }
    return own;
  }

  private static int[] prepend(int lead, List<Integer> group) {
    int[] members = new int[group.size() + 1];
    members[0] = lead;
    for (int k = 0; k < group.size(); k++) {
      members[k + 1] = group.get(k);
    }
    return members;
  }

  private static boolean smooth(Facts f, int[] members) {
    for (int j : members) {
      if (!f.smooth()[j]) {
        return false;
      }
    }
    return true;
  }

  private static String label(Facts f, int j) {
    return f.unknowns().get(j).label();
  }
}
