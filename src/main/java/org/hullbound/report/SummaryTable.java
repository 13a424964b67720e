package org.hullbound.report;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Function;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.VariableSummary;

/**
 * The posterior summary of a run, one row per unknown, rendered as an aligned text table for a
 * terminal or as CSV for {@code summary.csv}.
 *
 * <p>Why two renderings: a person reads a few rounded digits, a program wants every digit. The
 * text table shows 4 significant digits for estimates, 3 decimals for R-hat, whole effective
 * sample sizes and 2 digits for the Monte Carlo error; the CSV (RFC 4180, CRLF line ends, one
 * header row) carries full double precision. Statistics are defined in {@link
 * org.hullbound.diagnostics} (Vehtari et al. 2021).
 *
 * <p>The text table is laid out around the questions a reader asks, in three groups under a
 * line that names them: the estimate (mean with its Monte Carlo standard error, sd, and the 95%
 * central interval as one {@code lo .. hi} cell in the model language's range notation), the trust
 * in it (R-hat, bulk-ESS and tail-ESS as Vehtari et al. 2021 spell them, and a verdict mark: "ok",
 * or "check" when {@link Verdicts} has a finding about the unknown's draws), and the cost (the
 * update that drew the unknown and its log-density evaluations per draw, from {@link
 * UpdateFacts}). Groups are set apart by a bar.
 *
 * <p>The CSV columns are named in lower case with underscores, stable for programs; {@link
 * #CSV_HEADER} lists them and {@code docs/diagnostics.md} defines each.
 */
public final class SummaryTable {
  private static final String COLUMN_GAP = "  ";
  private static final String GROUP_GAP = "  |  ";

  /** The CSV columns, in order; see {@link #csv()}. */
  public static final List<String> CSV_HEADER =
      List.of(
          "unknown",
          "mean",
          "mean_mcse",
          "sd",
          "lower",
          "median",
          "upper",
          "level",
          "rhat",
          "rhat_rank",
          "rhat_folded",
          "bulk_ess",
          "tail_ess",
          "mean_ess",
          "lower_mcse",
          "median_mcse",
          "upper_mcse",
          "chains",
          "draws_per_chain",
          "update",
          "evaluations_per_draw",
          "fallback",
          "fallback_sweep",
          "status",
          "notes");

  /** The probability inside the central interval of the table and the CSV. */
  public static final double INTERVAL_LEVEL = 0.95;

  private final List<VariableSummary> summaries;
  private final Map<String, UpdateFacts> updates;
  private final double level;
  /** The interval ends at {@link #level} by name; empty at 0.95, where the summaries hold them. */
  private final Map<String, CentralInterval> intervals;

  private SummaryTable(List<VariableSummary> summaries, Map<String, UpdateFacts> updates) {
    this(summaries, updates, INTERVAL_LEVEL, Map.of());
  }

  private SummaryTable(
      List<VariableSummary> summaries,
      Map<String, UpdateFacts> updates,
      double level,
      Map<String, CentralInterval> intervals) {
    this.summaries = summaries;
    this.updates = updates;
    this.level = level;
    this.intervals = intervals;
  }

  /**
   * This table with central intervals of probability {@code level} (e.g. 0.9), computed from
   * {@code draws} (one entry per summary, in table order) by {@link CentralInterval}. In the CSV,
   * {@code lower}, {@code upper} and {@code level} then describe this interval; {@code lower_mcse}
   * and {@code upper_mcse}, known only for the 2.5% and 97.5% quantiles, are left empty.
   *
   * @throws IllegalArgumentException if the level is not in (0, 1) or the draws do not match
   */
  public SummaryTable withIntervalLevel(double level, List<Draws> draws) {
    if (!(level > 0 && level < 1)) {
      throw new IllegalArgumentException("level must lie strictly between 0 and 1, got " + level);
    }
    if (draws == null || draws.size() != summaries.size()) {
      throw new IllegalArgumentException("draws must hold one entry per summary");
    }
    if (level == INTERVAL_LEVEL) {
      return new SummaryTable(summaries, updates);
    }
    Map<String, CentralInterval> ends = new HashMap<>();
    for (int k = 0; k < summaries.size(); k++) {
      ends.put(summaries.get(k).name(), CentralInterval.of(draws.get(k), level));
    }
    return new SummaryTable(summaries, updates, level, Map.copyOf(ends));
  }

  /** The probability inside the table's central intervals (0.95 unless set). */
  public double intervalLevel() {
    return level;
  }

  /** The lower end of the central interval of {@code s} at the table's level. */
  private double lower(VariableSummary s) {
    CentralInterval i = intervals.get(s.name());
    return i == null ? s.q025() : i.lower();
  }

  /** The upper end of the central interval of {@code s} at the table's level. */
  private double upper(VariableSummary s) {
    CentralInterval i = intervals.get(s.name());
    return i == null ? s.q975() : i.upper();
  }

  /** A table of the summaries alone; the update columns show "n/a". */
  public static SummaryTable of(List<VariableSummary> summaries) {
    return of(summaries, Map.of());
  }

  /**
   * A table of the summaries with each unknown's update facts, looked up by name.
   *
   * @param summaries one per unknown, in the order to show; names distinct
   * @param updates facts by unknown name; unknowns without an entry show "n/a"
   * @throws IllegalArgumentException if a list or map is null, holds null, repeats a name, or
   *     names an unknown that is not among the summaries
   */
  public static SummaryTable of(List<VariableSummary> summaries, Map<String, UpdateFacts> updates) {
    if (summaries == null) {
      throw new IllegalArgumentException("summaries must not be null");
    }
    if (updates == null) {
      throw new IllegalArgumentException("updates must not be null (use an empty map)");
    }
    Set<String> names = new HashSet<>();
    for (VariableSummary summary : summaries) {
      if (summary == null) {
        throw new IllegalArgumentException("summaries must not hold null");
      }
      if (!names.add(summary.name())) {
        throw new IllegalArgumentException(
            "summaries must have distinct names, got '" + summary.name() + "' twice");
      }
    }
    Map<String, UpdateFacts> copy = new LinkedHashMap<>();
    for (Map.Entry<String, UpdateFacts> entry : updates.entrySet()) {
      if (!names.contains(entry.getKey())) {
        throw new IllegalArgumentException(
            "updates name an unknown without a summary: '" + entry.getKey() + "'");
      }
      if (entry.getValue() == null) {
        throw new IllegalArgumentException(
            "updates must not map '" + entry.getKey() + "' to null");
      }
      copy.put(entry.getKey(), entry.getValue());
    }
    return new SummaryTable(List.copyOf(summaries), Map.copyOf(copy));
  }

  /** The summaries in table order. */
  public List<VariableSummary> summaries() {
    return summaries;
  }

  /** The update facts by unknown name (only those supplied). */
  public Map<String, UpdateFacts> updates() {
    return updates;
  }

  /**
   * The aligned text table: a caption line with the chain layout when it is the same for every
   * unknown, a heading row, a rule, and one row per unknown. Text columns are left-aligned,
   * numbers right-aligned, NaN shown as "n/a". Lines end with {@code \n}.
   */
  public String text() {
    return text(Verdicts.DEFAULT_MAX_RHAT, Verdicts.DEFAULT_MIN_ESS);
  }

  /**
   * The aligned text table with the verdict mark judged at the given thresholds, so that the mark
   * agrees with verdict lines made by {@link Verdicts#of(SummaryTable, double, double)}.
   */
  public String text(double maxRhat, double minEss) {
    List<Column> columns = textColumns(maxRhat, minEss);
    List<String[]> cells = new ArrayList<>();
    for (VariableSummary summary : summaries) {
      String[] row = new String[columns.size()];
      for (int k = 0; k < row.length; k++) {
        row[k] = columns.get(k).cell.apply(summary);
      }
      cells.add(row);
    }
    int[] widths = new int[columns.size()];
    for (int k = 0; k < widths.length; k++) {
      widths[k] = columns.get(k).heading.length();
      for (String[] row : cells) {
        widths[k] = Math.max(widths[k], row[k].length());
      }
    }
    widenForGroupLabels(columns, widths);
    StringBuilder text = new StringBuilder();
    String caption = caption();
    if (!caption.isEmpty()) {
      text.append(caption).append('\n');
    }
    appendGroupLine(text, columns, widths);
    String[] headings = columns.stream().map(c -> c.heading).toArray(String[]::new);
    appendRow(text, columns, widths, headings);
    String[] rules = new String[columns.size()];
    for (int k = 0; k < rules.length; k++) {
      rules[k] = "-".repeat(widths[k]);
    }
    appendRow(text, columns, widths, rules);
    for (String[] row : cells) {
      appendRow(text, columns, widths, row);
    }
    return text.toString();
  }

  /**
   * The table as CSV (RFC 4180): the {@link #CSV_HEADER} row, then one record per unknown with
   * numbers in full precision (Java's shortest round-trip form, e.g. {@code 0.1}, {@code
   * 1.0E-12}), NaN as {@code NaN}, infinities as {@code Inf} and {@code -Inf}, and empty fields
   * for absent update facts. Notes are joined with "; ". Records end with CRLF.
   */
  public String csv() {
    StringBuilder out = new StringBuilder();
    writeCsv(out);
    return out.toString();
  }

  /**
   * Writes {@link #csv()} to {@code out} and flushes it, leaving it open; I/O failures of {@code
   * out} are rethrown unchecked.
   */
  public void writeCsv(Appendable out) {
    if (out == null) {
      throw new IllegalArgumentException("out must not be null");
    }
    try {
      // Not closed: closing a CSVPrinter would close the caller's writer.
      CSVPrinter printer =
          new CSVPrinter(
              out, CSVFormat.RFC4180.builder().setHeader(CSV_HEADER.toArray(String[]::new)).get());
      for (VariableSummary s : summaries) {
        UpdateFacts facts = updates.get(s.name());
        printer.printRecord(
            s.name(),
            full(s.mean()),
            full(s.mcseMean()),
            full(s.sd()),
            full(lower(s)),
            full(s.q50()),
            full(upper(s)),
            full(level),
            full(s.rhat()),
            full(s.rhatBulk()),
            full(s.rhatTail()),
            full(s.essBulk()),
            full(s.essTail()),
            full(s.essMean()),
            intervals.isEmpty() ? full(s.mcseQ025()) : "",
            full(s.mcseQ50()),
            intervals.isEmpty() ? full(s.mcseQ975()) : "",
            Integer.toString(s.chains()),
            Integer.toString(s.drawsPerChain()),
            facts == null ? "" : facts.update(),
            facts == null ? "" : full(facts.evaluationsPerDraw()),
            facts == null ? "" : fallbackName(facts.fallback()),
            facts == null || facts.switchSweep() == 0 ? "" : Long.toString(facts.switchSweep()),
            s.state().name().toLowerCase(java.util.Locale.ROOT).replace('_', ' '),
            String.join("; ", s.notes()));
      }
      printer.flush();
    } catch (IOException e) {
      throw new UncheckedIOException("writing the summary CSV failed", e);
    }
  }

  private List<Column> textColumns(double maxRhat, double minEss) {
    Set<String> doubtful = new HashSet<>();
    for (Verdict verdict : Verdicts.of(this, maxRhat, minEss).verdicts()) {
      if (verdict.kind() != Verdict.Kind.FALLBACK_USED
          && verdict.kind() != Verdict.Kind.SWITCHED_TO_FALLBACK) {
        doubtful.add(verdict.unknown());
      }
    }
    // The lower ends are padded to one width so that the ".." of every interval lines up.
    int lowerWidth =
        summaries.stream()
            .mapToInt(s -> NumberText.significant(lower(s), 4).length())
            .max()
            .orElse(0);
    List<Column> columns = new ArrayList<>();
    columns.add(new Column(Group.NAME, "unknown", true, VariableSummary::name));
    columns.add(new Column(Group.ESTIMATE, "mean +- mcse", false, SummaryTable::meanWithError));
    columns.add(
        new Column(Group.ESTIMATE, "sd", false, s -> NumberText.significant(s.sd(), 4)));
    columns.add(
        new Column(
            Group.ESTIMATE,
            CentralInterval.percent(level) + " interval",
            true,
            s -> interval(lower(s), upper(s), lowerWidth)));
    columns.add(new Column(Group.TRUST, "R-hat", false, s -> NumberText.fixed(s.rhat(), 3)));
    columns.add(
        new Column(Group.TRUST, "bulk-ESS", false, s -> NumberText.count(s.essBulk())));
    columns.add(
        new Column(Group.TRUST, "tail-ESS", false, s -> NumberText.count(s.essTail())));
    columns.add(
        new Column(
            Group.TRUST, "verdict", true, s -> doubtful.contains(s.name()) ? "check" : "ok"));
    if (updates.isEmpty()) {
      // A draws file alone does not say how its draws were made: a cost group of "n/a" says
      // nothing.
      return columns;
    }
    columns.add(
        new Column(Group.COST, "update", true, s -> updateName(updates.get(s.name()))));
    columns.add(
        new Column(
            Group.COST, "evals per draw", false, s -> evaluations(updates.get(s.name()))));
    return columns;
  }

  private static String interval(double low, double high, int lowerWidth) {
    if (Double.isNaN(low) || Double.isNaN(high)) {
      return NumberText.NOT_AVAILABLE;
    }
    String lower = NumberText.significant(low, 4);
    String upper = NumberText.significant(high, 4);
    return " ".repeat(lowerWidth - lower.length()) + lower + " .. " + upper;
  }

  private static String meanWithError(VariableSummary s) {
    String mean = NumberText.significant(s.mean(), 4);
    return Double.isNaN(s.mcseMean())
        ? mean
        : mean + " +- " + NumberText.significant(s.mcseMean(), 2);
  }

  private String caption() {
    if (summaries.isEmpty()) {
      return "no unknowns to summarise";
    }
    int chains = summaries.get(0).chains();
    int draws = summaries.get(0).drawsPerChain();
    for (VariableSummary s : summaries) {
      if (s.chains() != chains || s.drawsPerChain() != draws) {
        return "";
      }
    }
    return chains
        + (chains == 1 ? " chain" : " chains")
        + " of "
        + draws
        + (draws == 1 ? " draw" : " draws")
        + "; R-hat, bulk-ESS and tail-ESS from rank-normalised split chains";
  }

  private static void appendRow(
      StringBuilder text, List<Column> columns, int[] widths, String[] cells) {
    StringBuilder line = new StringBuilder();
    for (int k = 0; k < cells.length; k++) {
      if (k > 0) {
        line.append(columns.get(k).group == columns.get(k - 1).group ? COLUMN_GAP : GROUP_GAP);
      }
      String pad = " ".repeat(widths[k] - cells[k].length());
      if (columns.get(k).leftAligned) {
        line.append(cells[k]).append(pad);
      } else {
        line.append(pad).append(cells[k]);
      }
    }
    text.append(line.toString().stripTrailing()).append('\n');
  }

  /** The line above the headings: each group's label over its columns, set apart by bars. */
  private static void appendGroupLine(StringBuilder text, List<Column> columns, int[] widths) {
    String[] labels = new String[columns.size()];
    for (int k = 0; k < labels.length; k++) {
      boolean first = k == 0 || columns.get(k).group != columns.get(k - 1).group;
      labels[k] = first ? columns.get(k).group.label : "";
    }
    StringBuilder line = new StringBuilder();
    int k = 0;
    while (k < labels.length) {
      Group group = columns.get(k).group;
      int width = 0;
      int start = k;
      while (k < labels.length && columns.get(k).group == group) {
        width += widths[k] + (k > start ? COLUMN_GAP.length() : 0);
        k++;
      }
      if (start > 0) {
        line.append(GROUP_GAP);
      }
      line.append(labels[start]).append(" ".repeat(width - labels[start].length()));
    }
    text.append(line.toString().stripTrailing()).append('\n');
  }

  /** Makes each group at least as wide as its label, widening its last column. */
  private static void widenForGroupLabels(List<Column> columns, int[] widths) {
    int k = 0;
    while (k < widths.length) {
      Group group = columns.get(k).group;
      int start = k;
      int width = 0;
      while (k < widths.length && columns.get(k).group == group) {
        width += widths[k] + (k > start ? COLUMN_GAP.length() : 0);
        k++;
      }
      widths[k - 1] += Math.max(0, group.label.length() - width);
    }
  }

  private static String updateName(UpdateFacts facts) {
    return facts == null ? NumberText.NOT_AVAILABLE : facts.update();
  }

  private static String evaluations(UpdateFacts facts) {
    if (facts == null) {
      return NumberText.NOT_AVAILABLE;
    }
    double e = facts.evaluationsPerDraw();
    return e == 0 ? "0" : NumberText.significant(e, 3);
  }

  private static String fallbackName(UpdateFacts.Fallback fallback) {
    return switch (fallback) {
      case NONE -> "no";
      case CHOSEN -> "chosen";
      case SWITCHED_DURING_RUN -> "switched during run";
    };
  }

  /** Full-precision text of a double, with R-style names for the non-finite values. */
  static String full(double x) {
    if (Double.isNaN(x)) {
      return "NaN";
    }
    if (Double.isInfinite(x)) {
      return x > 0 ? "Inf" : "-Inf";
    }
    return Double.toString(x);
  }

  /** The questions the text table's columns answer, in order. */
  private enum Group {
    NAME(""),
    ESTIMATE("estimate"),
    TRUST("trust"),
    COST("cost");

    private final String label;

    Group(String label) {
      this.label = label;
    }
  }

  private record Column(
      Group group, String heading, boolean leftAligned, Function<VariableSummary, String> cell) {}
}
