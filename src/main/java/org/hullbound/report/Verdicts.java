package org.hullbound.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.VariableSummary;

/**
 * Plain-language verdicts on a run: one line per problem per unknown, saying what it means and
 * what to do, or one line saying that all is well.
 *
 * <p>Why: a table of R-hat and ess values asks the reader to know the thresholds; a verdict
 * states the conclusion. The default thresholds are those recommended by Vehtari, Gelman,
 * Simpson, Carpenter and Buerkner (2021), Bayesian Analysis 16(2), section 4.4 (as recalled):
 * R-hat below 1.01, and bulk and tail effective sample size of at least 400 (100 per chain for
 * four chains). Draws of two values only have no tail-ESS and are judged on bulk-ESS and R-hat
 * ({@link VariableSummary.State#TWO_VALUED}); the closing line says so.
 */
public final class Verdicts {
  /** Largest acceptable R-hat by default (Vehtari et al. 2021). */
  public static final double DEFAULT_MAX_RHAT = 1.01;

  /** Smallest acceptable bulk and tail effective sample size by default (Vehtari et al. 2021). */
  public static final double DEFAULT_MIN_ESS = 400;

  private final List<Verdict> verdicts;
  /** Rows judged: the unknowns and the kept derived quantities. */
  private final int unknowns;
  /** Of those, the derived quantities (kept {@code let}s), which the closing line names apart. */
  private final int derived;
  /** Of the rows, those whose draws take two values only, judged without tail-ESS. */
  private final List<String> twoValued;
  private final double maxRhat;
  private final double minEss;

  private Verdicts(
      List<Verdict> verdicts, int unknowns, int derived, List<String> twoValued, double maxRhat,
      double minEss) {
    this.verdicts = verdicts;
    this.unknowns = unknowns;
    this.derived = derived;
    this.twoValued = twoValued;
    this.maxRhat = maxRhat;
    this.minEss = minEss;
  }

  /** Verdicts on the table's summaries and update facts with the default thresholds. */
  public static Verdicts of(SummaryTable table) {
    return of(table, DEFAULT_MAX_RHAT, DEFAULT_MIN_ESS);
  }

  /**
   * Verdicts with chosen thresholds.
   *
   * @param maxRhat R-hat above this is flagged; must be &gt; 1
   * @param minEss bulk or tail ess below this is flagged; must be &gt; 0
   */
  public static Verdicts of(SummaryTable table, double maxRhat, double minEss) {
    if (table == null) {
      throw new IllegalArgumentException("table must not be null");
    }
    if (!(maxRhat > 1) || Double.isInfinite(maxRhat)) {
      throw new IllegalArgumentException("maxRhat must be finite and > 1, got " + maxRhat);
    }
    if (!(minEss > 0) || Double.isInfinite(minEss)) {
      throw new IllegalArgumentException("minEss must be finite and > 0, got " + minEss);
    }
    List<Verdict> found = new ArrayList<>();
    int derived = 0;
    List<String> twoValued = new ArrayList<>();
    for (VariableSummary summary : table.summaries()) {
      UpdateFacts facts = table.updates().get(summary.name());
      judge(summary, facts, maxRhat, minEss, found);
      derived += facts != null && facts.isDerived() ? 1 : 0;
      if (summary.state() == VariableSummary.State.TWO_VALUED) {
        twoValued.add(summary.name());
      }
    }
    return new Verdicts(
        List.copyOf(found), table.summaries().size(), derived, List.copyOf(twoValued), maxRhat,
        minEss);
  }

  /**
   * These verdicts with label switching named where chains order a mixture's components
   * differently ({@link LabelSwitching}); {@code components} lists each group of components'
   * labels (the elements of a name selected through an unknown index), {@code draws} the kept
   * draws by label.
   */
  public Verdicts withLabelSwitching(List<List<String>> components, Map<String, Draws> draws) {
    return new Verdicts(LabelSwitching.apply(verdicts, components, draws), unknowns, derived,
        twoValued, maxRhat, minEss);
  }

  /**
   * These verdicts with label switching named where the draws alone show it, for draws read
   * without their model ({@code summarize}, {@code report DIR}; {@link
   * LabelSwitching#applyFromDraws}): {@code labels} are the draws' columns in order, {@code draws}
   * the draws by label.
   */
  public Verdicts withLabelSwitchingFoundInDraws(List<String> labels, Map<String, Draws> draws) {
    return new Verdicts(LabelSwitching.applyFromDraws(verdicts, labels, draws, maxRhat), unknowns,
        derived, twoValued, maxRhat, minEss);
  }

  /** The findings, unknown by unknown in table order; empty when all is well. */
  public List<Verdict> verdicts() {
    return verdicts;
  }

  /** Whether nothing was found. */
  public boolean allWell() {
    return verdicts.isEmpty();
  }

  /**
   * The lines to show: every finding's text, then one closing line; when nothing was found, the
   * closing line alone says so.
   */
  public List<String> lines() {
    List<String> lines = new ArrayList<>();
    for (Verdict verdict : verdicts) {
      lines.add(verdict.text());
    }
    if (unknowns == 0) {
      lines.add("no unknowns to judge");
    } else if (verdicts.isEmpty()) {
      lines.add(
          (unknowns == 1 ? "The " + noun(1) + " looks"
              : unknowns == 2 ? "Both " + noun(2) + " look"
                  : "All " + unknowns + " " + noun(unknowns) + " look")
              + " converged: R-hat at most "
              + plain(maxRhat)
              + ", bulk-ESS and tail-ESS at least "
              + plain(minEss)
              + twoValuedClause()
              + ", no fallback update.");
    } else {
      long flagged = verdicts.stream().map(Verdict::unknown).distinct().count();
      lines.add(
          (unknowns == 1 ? "The " + noun(1) + " needs"
              : flagged == unknowns
                  ? (unknowns == 2 ? "Both " + noun(2) + " need"
                      : "All " + unknowns + " " + noun(unknowns) + " need")
                  : flagged + " of " + unknowns + " " + noun(unknowns) + " "
                      + (flagged == 1 ? "needs" : "need"))
              + " attention (see above)"
              + (flagged < unknowns ? "; the others look converged." : "."));
    }
    return List.copyOf(lines);
  }

  /**
   * Says which rows were judged without tail-ESS: draws of two values have none (see {@link
   * org.hullbound.diagnostics.VariableSummary.State#TWO_VALUED}).
   */
  private String twoValuedClause() {
    if (twoValued.isEmpty()) {
      return "";
    }
    int shown = Math.min(3, twoValued.size());
    String names = String.join(", ", twoValued.subList(0, shown))
        + (twoValued.size() > shown ? " and " + (twoValued.size() - shown) + " more" : "");
    return " (" + names + (twoValued.size() == 1 ? " takes" : " take") + " two values only:"
        + " tail-ESS is not defined there, so " + (twoValued.size() == 1 ? "it is" : "they are")
        + " judged on bulk-ESS and R-hat alone)";
  }

  /**
   * What the closing line counts: "unknowns", or, when kept derived quantities are among the rows,
   * "quantities" with the split in brackets, so that a model of 2 unknowns and 5 lets is not
   * called one of 7 unknowns.
   */
  private String noun(int count) {
    if (derived == 0) {
      return count == 1 ? "unknown" : "unknowns";
    }
    int drawn = unknowns - derived;
    return (count == 1 ? "quantity" : "quantities") + " (" + drawn
        + (drawn == 1 ? " unknown, " : " unknowns, ") + derived + " derived)";
  }

  private static void judge(
      VariableSummary s, UpdateFacts facts, double maxRhat, double minEss, List<Verdict> found) {
    String name = s.name();
    switch (s.state()) {
      case NON_FINITE -> found.add(
          new Verdict(
              name,
              Verdict.Kind.NON_FINITE,
              name
                  + ": some draws are not finite numbers ("
                  + firstNote(s)
                  + "); check the model for a density that overflows and the starting values"
                  + " for impossible ones"));
      case CONSTANT -> found.add(
          new Verdict(
              name,
              Verdict.Kind.CONSTANT,
              name
                  + ": every draw equals "
                  + SummaryTable.full(s.mean())
                  + ", so convergence cannot be judged; if it should vary, check that it is"
                  + " being updated"));
      case TOO_SHORT -> found.add(
          new Verdict(
              name,
              Verdict.Kind.TOO_SHORT,
              name
                  + ": only "
                  + s.drawsPerChain()
                  + " draws per chain, too few to judge convergence; run longer"));
      case COMPLETE, TWO_VALUED -> judgeDiagnostics(s, maxRhat, minEss, found);
    }
    if (facts != null) {
      judgeUpdate(name, facts, found);
    }
  }

  private static void judgeDiagnostics(
      VariableSummary s, double maxRhat, double minEss, List<Verdict> found) {
    String name = s.name();
    String limit = plain(maxRhat);
    if (s.rhat() == Double.POSITIVE_INFINITY) {
      found.add(
          new Verdict(
              name,
              Verdict.Kind.CHAINS_DISAGREE,
              name
                  + (s.chains() == 1
                      ? ": the two halves of the chain are stuck at different values (R-hat inf > "
                      : ": chains are stuck at different values (R-hat inf > ")
                  + limit
                  + "); check that it is being updated and the starting values"));
    } else if (s.rhat() > maxRhat) {
      boolean spreadOnly = !(s.rhatBulk() > maxRhat);
      found.add(
          new Verdict(
              name,
              Verdict.Kind.CHAINS_DISAGREE,
              name
                  + ": "
                  + disagree(s.chains())
                  + (spreadOnly ? " in spread (R-hat " : " (R-hat ")
                  + rhatText(s.rhat(), maxRhat)
                  + " > "
                  + limit
                  + "); run longer or check the starting values"));
    } else if (Double.isNaN(s.rhat())) {
      found.add(
          new Verdict(
              name,
              Verdict.Kind.RHAT_UNDEFINED,
              name
                  + ": R-hat is undefined ("
                  + firstNote(s)
                  + "); judge convergence from trace plots"));
    }
    if (s.essBulk() < minEss) {
      found.add(
          new Verdict(
              name,
              Verdict.Kind.FEW_BULK_DRAWS,
              name
                  + ": few effective draws in the bulk (bulk-ESS "
                  + NumberText.count(s.essBulk())
                  + " < "
                  + plain(minEss)
                  + "); mean and median are imprecise; "
                  + runLonger(s.essBulk(), minEss)));
    }
    if (s.essTail() < minEss) {
      found.add(
          new Verdict(
              name,
              Verdict.Kind.FEW_TAIL_DRAWS,
              name
                  + ": few effective draws in the tails (tail-ESS "
                  + NumberText.count(s.essTail())
                  + " < "
                  + plain(minEss)
                  + "); the 2.5% and 97.5% points are imprecise; "
                  + runLonger(s.essTail(), minEss)));
    } else if (Double.isNaN(s.essTail()) && s.state() != VariableSummary.State.TWO_VALUED) {
      found.add(
          new Verdict(
              name,
              Verdict.Kind.FEW_TAIL_DRAWS,
              name
                  + ": tail ess is undefined because many draws tie at an end; tail quantiles"
                  + " may be unreliable, check whether the unknown is nearly discrete"));
    }
  }

  /**
   * Who disagrees: R-hat compares the two halves of each chain (split R-hat), so with one chain
   * it is the halves.
   */
  private static String disagree(int chains) {
    return chains == 1 ? "the two halves of the chain disagree" : "chains disagree";
  }

  private static void judgeUpdate(String name, UpdateFacts facts, List<Verdict> found) {
    switch (facts.fallback()) {
      case NONE -> {}
      case CHOSEN -> found.add(
          new Verdict(
              name,
              Verdict.Kind.FALLBACK_USED,
              name
                  + ": drawn by "
                  + facts.update()
                  + " because its conditional is not known to be log-concave; these draws are"
                  + " correlated, so rely on its ess rather than its draw count"));
      case SWITCHED_DURING_RUN -> found.add(
          new Verdict(
              name,
              Verdict.Kind.SWITCHED_TO_FALLBACK,
              name
                  + ": switched to "
                  + facts.update()
                  + (facts.switchSweep() > 0 ? " at sweep " + facts.switchSweep() : " during the run")
                  + " because adaptive rejection met a conditional that is not log-concave, or whose"
                  + " log-density is rounded too coarsely to tell;"
                  + " draws before the switch may come from a wrong envelope, so treat those"
                  + " sweeps as burn-in or run again"));
    }
  }

  /** R-hat to 3 decimals, or 4 when 3 would round it down to the threshold. */
  private static String rhatText(double rhat, double maxRhat) {
    String text = NumberText.fixed(rhat, 3);
    return Double.parseDouble(text) > maxRhat ? text : NumberText.fixed(rhat, 4);
  }

  private static String runLonger(double ess, double minEss) {
    if (!(ess > 0)) {
      return "run much longer or improve mixing";
    }
    double factor = Math.ceil(10 * minEss / ess) / 10;
    if (factor > 10) {
      return "run over 10 times longer or improve mixing";
    }
    return "run about " + plain(factor) + " times longer";
  }

  private static String firstNote(VariableSummary s) {
    return s.notes().isEmpty() ? "no further detail" : s.notes().get(0);
  }

  /** A threshold as typed: 1.01, 400, 2.5. */
  private static String plain(double x) {
    String text = new java.math.BigDecimal(Double.toString(x)).stripTrailingZeros().toPlainString();
    return text.toLowerCase(Locale.ROOT);
  }
}
