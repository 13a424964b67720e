package org.hullbound.report;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Function;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
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
 * <table>
 *   <caption>Text table columns</caption>
 *   <tr><td>unknown</td><td>the unknown's name</td></tr>
 *   <tr><td>mean, sd</td><td>posterior mean and standard deviation</td></tr>
 *   <tr><td>2.5%, median, 97.5%</td><td>posterior quantiles (Hyndman and Fan definition 7)</td></tr>
 *   <tr><td>R-hat</td><td>rank-normalised split R-hat, the larger of bulk and tail</td></tr>
 *   <tr><td>ess bulk, ess tail</td><td>bulk and tail effective sample size</td></tr>
 *   <tr><td>mcse</td><td>Monte Carlo standard error of the mean</td></tr>
 *   <tr><td>update</td><td>the update that drew the unknown, from {@link UpdateFacts}</td></tr>
 *   <tr><td>evals/draw</td><td>log-density evaluations per draw, from {@link UpdateFacts}</td></tr>
 * </table>
 */
public final class SummaryTable {
  private static final String COLUMN_GAP = "  ";

  /** The CSV columns, in order; see {@link #csv()}. */
  public static final List<String> CSV_HEADER =
      List.of(
          "unknown",
          "mean",
          "sd",
          "2.5%",
          "median",
          "97.5%",
          "R-hat",
          "R-hat bulk",
          "R-hat tail",
          "ess bulk",
          "ess tail",
          "ess mean",
          "mcse mean",
          "mcse 2.5%",
          "mcse median",
          "mcse 97.5%",
          "chains",
          "draws per chain",
          "update",
          "evals/draw",
          "fallback",
          "switch sweep",
          "state",
          "notes");

  private final List<VariableSummary> summaries;
  private final Map<String, UpdateFacts> updates;

  private SummaryTable(List<VariableSummary> summaries, Map<String, UpdateFacts> updates) {
    this.summaries = summaries;
    this.updates = updates;
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
    List<Column> columns = textColumns();
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
    StringBuilder text = new StringBuilder();
    String caption = caption();
    if (!caption.isEmpty()) {
      text.append(caption).append('\n');
    }
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
            full(s.sd()),
            full(s.q025()),
            full(s.q50()),
            full(s.q975()),
            full(s.rhat()),
            full(s.rhatBulk()),
            full(s.rhatTail()),
            full(s.essBulk()),
            full(s.essTail()),
            full(s.essMean()),
            full(s.mcseMean()),
            full(s.mcseQ025()),
            full(s.mcseQ50()),
            full(s.mcseQ975()),
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

  private List<Column> textColumns() {
    List<Column> columns = new ArrayList<>();
    columns.add(new Column("unknown", true, VariableSummary::name));
    columns.add(new Column("mean", false, s -> NumberText.significant(s.mean(), 4)));
    columns.add(new Column("sd", false, s -> NumberText.significant(s.sd(), 4)));
    columns.add(new Column("2.5%", false, s -> NumberText.significant(s.q025(), 4)));
    columns.add(new Column("median", false, s -> NumberText.significant(s.q50(), 4)));
    columns.add(new Column("97.5%", false, s -> NumberText.significant(s.q975(), 4)));
    columns.add(new Column("R-hat", false, s -> NumberText.fixed(s.rhat(), 3)));
    columns.add(new Column("ess bulk", false, s -> NumberText.count(s.essBulk())));
    columns.add(new Column("ess tail", false, s -> NumberText.count(s.essTail())));
    columns.add(new Column("mcse", false, s -> NumberText.significant(s.mcseMean(), 2)));
    columns.add(new Column("update", true, s -> updateName(updates.get(s.name()))));
    columns.add(
        new Column("evals/draw", false, s -> evaluations(updates.get(s.name()))));
    return columns;
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
        + "; R-hat and ess from rank-normalised split chains";
  }

  private static void appendRow(
      StringBuilder text, List<Column> columns, int[] widths, String[] cells) {
    StringBuilder line = new StringBuilder();
    for (int k = 0; k < cells.length; k++) {
      if (k > 0) {
        line.append(COLUMN_GAP);
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

  private record Column(
      String heading, boolean leftAligned, Function<VariableSummary, String> cell) {}
}
