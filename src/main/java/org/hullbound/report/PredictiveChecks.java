package org.hullbound.report;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.MonteCarloStandardError;

/**
 * Posterior predictive p-values (Gelman, Meng and Stern 1996, Statistica Sinica 6, 733-807) of a
 * run's test quantities, with their Monte Carlo standard errors, as a CSV, a terminal table with
 * plain-words flags, and report panels.
 *
 * <p>The p-value of a quantity T is the share of kept sweeps whose replicated T is at least the
 * observed one. Ties, which discrete data make common (a replicated maximum count equal to the
 * observed), count one half each: the mid-p convention (Lancaster 1961, "Significance tests in
 * discrete distributions", JASA 56, 223-234), so that a discrete statistic is not pushed towards
 * 1 by its ties. The p-value is thus the posterior mean of an indicator per sweep (1 above, 1/2
 * tied, 0 below); its MCSE is that mean's ({@link MonteCarloStandardError#mean}), NaN when every
 * sweep gave the same indicator. A p-value below {@link #LOW} or above {@link #HIGH} is flagged
 * (a threshold of common practice, not a test: the p-values of a correct model are not uniform,
 * they gather towards 1/2; Meng 1994, Annals of Statistics 22, 1142-1160).
 */
public final class PredictiveChecks {
  /** The CSV file's name in the output folder. */
  public static final String FILE_NAME = "predictive_checks.csv";

  /** The CSV header. */
  public static final List<String> CSV_HEADER =
      List.of(
          "node", "quantity", "source", "observed", "observed_varies", "replicated_mean",
          "replicated_sd", "p_value", "p_value_mcse", "tie_share", "sweeps", "flag");

  /**
   * The per-sweep file beside {@link #FILE_NAME}: each quantity's observed and replicated value
   * of every kept sweep, columns named by {@link #sweepColumn}, so that {@code report DIR} draws
   * the panels again as {@code fit} drew them.
   */
  public static final String SWEEPS_FILE = "predictive_sweeps.csv";

  /** p-values below this are flagged. */
  public static final double LOW = 0.05;

  /** p-values above this are flagged. */
  public static final double HIGH = 0.95;

  private static final int BINS = 30;

  private final List<Row> rows;

  /**
   * One quantity's draws: the observed and replicated value of each kept sweep, {@code
   * [chain][draw]}; {@code fromModelFile} for a {@code check} statement.
   */
  public record Input(
      String node, String quantity, boolean fromModelFile, double[][] observed,
      double[][] replicated) {}

  /**
   * One quantity's result. {@code observed} is the observed value, or its mean over sweeps when it
   * reads unknowns ({@code observedVaries}); {@code differences} are replicated minus observed per
   * sweep, pooled, for the panel.
   */
  public record Row(
      String node, String quantity, boolean fromModelFile, double observed,
      boolean observedVaries, double replicatedMean, double replicatedSd, double pValue,
      double pValueMcse, double tieShare, long sweeps, double[] replicated,
      double[] differences) {

    /** "high" when the observed value lies above nearly every replicate, "low" below, else "". */
    public String flag() {
      return pValue < LOW ? "high" : pValue > HIGH ? "low" : "";
    }

    /** The flag in plain words, or empty. */
    public String words() {
      String what = (fromModelFile ? "check " + quantity : quantity.replace('_', ' ')) + " of "
          + node;
      if (pValue < LOW) {
        return "the model rarely reproduces the " + what + ": replicates reach the observed value"
            + " in " + share(pValue, sweeps);
      }
      if (pValue > HIGH) {
        return "the model rarely reproduces the " + what + ": replicates fall as low as the"
            + " observed value in " + share(1 - pValue, sweeps);
      }
      return "";
    }
  }

  private PredictiveChecks(List<Row> rows) {
    this.rows = List.copyOf(rows);
  }

  /** No checks: nothing in the report, the table or a file. */
  public static PredictiveChecks none() {
    return new PredictiveChecks(List.of());
  }

  /**
   * The p-values of {@code inputs}.
   *
   * @throws IllegalArgumentException if an input is null or its two draw arrays differ in shape
   */
  public static PredictiveChecks of(List<Input> inputs) {
    if (inputs == null) {
      throw new IllegalArgumentException("inputs must not be null");
    }
    List<Row> rows = new ArrayList<>();
    for (Input input : inputs) {
      rows.add(row(input));
    }
    return new PredictiveChecks(rows);
  }

  /**
   * The rows of a {@link #csv()} text, without the per-sweep values (a page drawn again from the
   * files shows the p-values, not the histograms).
   *
   * @throws IllegalArgumentException when the text is not such a CSV
   */
  public static PredictiveChecks fromCsv(String text) {
    if (text == null) {
      throw new IllegalArgumentException("text must not be null");
    }
    List<Row> rows = new ArrayList<>();
    try {
      List<CSVRecord> records =
          CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get()
              .parse(new java.io.StringReader(text)).getRecords();
      for (CSVRecord r : records) {
        rows.add(new Row(
            r.get("node"), r.get("quantity"), r.get("source").equals("check"),
            number(r.get("observed")), r.get("observed_varies").equals("yes"),
            number(r.get("replicated_mean")), number(r.get("replicated_sd")),
            number(r.get("p_value")), number(r.get("p_value_mcse")), number(r.get("tie_share")),
            Long.parseLong(r.get("sweeps")), new double[0], new double[0]));
      }
    } catch (IOException | RuntimeException bad) {
      throw new IllegalArgumentException("not a table of predictive checks: " + bad.getMessage(), bad);
    }
    return new PredictiveChecks(rows);
  }

  /**
   * The column of {@link #SWEEPS_FILE} holding one side ({@code observed} or {@code replicated})
   * of a quantity, e.g. {@code y mean observed} or {@code y check top replicated}; a {@code check}
   * may share a default quantity's name, so the source is part of it.
   */
  public static String sweepColumn(String node, String quantity, boolean fromModelFile, String side) {
    return node + (fromModelFile ? " check " : " ") + quantity + " " + side;
  }

  /**
   * The checks of {@code rows} (read back from {@link #FILE_NAME}) computed again from their
   * per-sweep values, {@code [chain][draw]} by {@link #sweepColumn}, so that the panels and every
   * figure are {@code fit}'s own; {@code rows} unchanged when a quantity's columns are missing.
   */
  public static PredictiveChecks fromSweeps(
      PredictiveChecks rows, java.util.function.Function<String, double[][]> sweeps) {
    List<Input> inputs = new ArrayList<>();
    for (Row row : rows.rows()) {
      double[][] observed =
          sweeps.apply(sweepColumn(row.node(), row.quantity(), row.fromModelFile(), "observed"));
      double[][] replicated =
          sweeps.apply(sweepColumn(row.node(), row.quantity(), row.fromModelFile(), "replicated"));
      if (observed == null || replicated == null) {
        return rows;
      }
      inputs.add(new Input(row.node(), row.quantity(), row.fromModelFile(), observed, replicated));
    }
    return of(inputs);
  }

  /** The inverse of {@link SummaryTable#full}. */
  private static double number(String text) {
    return switch (text) {
      case "NaN" -> Double.NaN;
      case "Inf" -> Double.POSITIVE_INFINITY;
      case "-Inf" -> Double.NEGATIVE_INFINITY;
      default -> Double.parseDouble(text);
    };
  }

  private static Row row(Input input) {
    if (input == null || input.observed() == null || input.replicated() == null
        || input.observed().length != input.replicated().length) {
      throw new IllegalArgumentException("an input must hold observed and replicated draws alike");
    }
    int chains = input.observed().length;
    double[][] indicator = new double[chains][];
    long sweeps = 0;
    long ties = 0;
    double observedSum = 0;
    boolean varies = false;
    double first = chains > 0 && input.observed()[0].length > 0 ? input.observed()[0][0] : Double.NaN;
    List<double[]> differences = new ArrayList<>();
    for (int c = 0; c < chains; c++) {
      double[] obs = input.observed()[c];
      double[] rep = input.replicated()[c];
      if (obs.length != rep.length) {
        throw new IllegalArgumentException("chain " + c + " has unequal observed and replicated draws");
      }
      indicator[c] = new double[obs.length];
      double[] difference = new double[obs.length];
      for (int d = 0; d < obs.length; d++) {
        // Mid-p: a tie counts one half (Lancaster 1961).
        indicator[c][d] = rep[d] > obs[d] ? 1 : rep[d] == obs[d] ? 0.5 : 0;
        ties += rep[d] == obs[d] ? 1 : 0;
        observedSum += obs[d];
        varies |= Double.compare(obs[d], first) != 0;
        difference[d] = rep[d] - obs[d];
      }
      sweeps += obs.length;
      differences.add(difference);
    }
    double[] pooledReplicated = pooled(List.of(input.replicated()));
    double pValue = sweeps == 0 ? Double.NaN : mean(pooled(List.of(indicator)));
    return new Row(
        input.node(), input.quantity(), input.fromModelFile(),
        varies ? observedSum / sweeps : first, varies, mean(pooledReplicated),
        sd(pooledReplicated), pValue, mcse(indicator), sweeps == 0 ? Double.NaN : (double) ties / sweeps,
        sweeps, pooledReplicated, pooled(differences));
  }

  /** The MCSE of the indicator's mean; NaN when it cannot be estimated (constant, too short, not finite). */
  private static double mcse(double[][] indicator) {
    if (indicator.length == 0 || indicator[0].length < 4) {
      return Double.NaN;
    }
    Draws draws = Draws.of(indicator);
    if (!draws.isFinite() || draws.isConstant()) {
      return Double.NaN;
    }
    return MonteCarloStandardError.mean(draws);
  }

  private static double[] pooled(List<double[]> chains) {
    int n = 0;
    for (double[] c : chains) {
      n += c.length;
    }
    double[] all = new double[n];
    int at = 0;
    for (double[] c : chains) {
      System.arraycopy(c, 0, all, at, c.length);
      at += c.length;
    }
    return all;
  }

  private static double mean(double[] values) {
    double sum = 0;
    for (double v : values) {
      sum += v;
    }
    return values.length == 0 ? Double.NaN : sum / values.length;
  }

  private static double sd(double[] values) {
    if (values.length < 2) {
      return Double.NaN;
    }
    double mean = mean(values);
    double squares = 0;
    for (double v : values) {
      squares += (v - mean) * (v - mean);
    }
    return Math.sqrt(squares / (values.length - 1));
  }

  /** The rows, one per quantity, in the order given. */
  public List<Row> rows() {
    return rows;
  }

  /** True when there are no quantities. */
  public boolean isEmpty() {
    return rows.isEmpty();
  }

  /** The flags in plain words, one sentence each, in row order. */
  public List<String> flags() {
    List<String> flags = new ArrayList<>();
    for (Row row : rows) {
      if (!row.words().isEmpty()) {
        flags.add(row.words());
      }
    }
    return flags;
  }

  /**
   * The CSV (RFC 4180) of {@link #CSV_HEADER}: numbers in full precision as in {@code
   * summary.csv} (NaN, Inf), {@code source} "default" or "check", {@code observed_varies}
   * "yes" or "no", {@code flag} "high", "low" or empty. Records end with CRLF.
   */
  public String csv() {
    StringBuilder out = new StringBuilder();
    try {
      CSVPrinter printer =
          new CSVPrinter(
              out, CSVFormat.RFC4180.builder().setHeader(CSV_HEADER.toArray(String[]::new)).get());
      for (Row r : rows) {
        printer.printRecord(
            r.node(), r.quantity(), r.fromModelFile() ? "check" : "default",
            SummaryTable.full(r.observed()), r.observedVaries() ? "yes" : "no",
            SummaryTable.full(r.replicatedMean()), SummaryTable.full(r.replicatedSd()),
            SummaryTable.full(r.pValue()), SummaryTable.full(r.pValueMcse()),
            SummaryTable.full(r.tieShare()), Long.toString(r.sweeps()), r.flag());
      }
      printer.flush();
    } catch (IOException e) {
      throw new UncheckedIOException("writing the predictive checks CSV failed", e);
    }
    return out.toString();
  }

  /**
   * A short terminal table: node, quantity, observed, replicated mean, p-value with its MCSE, and
   * a mark {@code <<} (observed above nearly every replicate) or {@code >>} (below); then the
   * flags in plain words. Lines end with {@code \n}; empty when there are no quantities.
   */
  public String text() {
    if (rows.isEmpty()) {
      return "";
    }
    List<String[]> cells = new ArrayList<>();
    cells.add(new String[] {"node", "quantity", "observed", "replicated", "p-value", "mcse", ""});
    for (Row r : rows) {
      cells.add(
          new String[] {
            r.node(), r.quantity() + (r.fromModelFile() ? " (check)" : ""),
            NumberText.significant(r.observed(), 4) + (r.observedVaries() ? "*" : ""),
            NumberText.significant(r.replicatedMean(), 4), NumberText.fixed(r.pValue(), 3),
            Double.isNaN(r.pValueMcse()) ? NumberText.NOT_AVAILABLE
                : NumberText.fixed(r.pValueMcse(), 3),
            r.flag().equals("high") ? "<<" : r.flag().equals("low") ? ">>" : ""
          });
    }
    int[] widths = new int[cells.get(0).length];
    for (String[] line : cells) {
      for (int k = 0; k < line.length; k++) {
        widths[k] = Math.max(widths[k], line[k].length());
      }
    }
    StringBuilder text = new StringBuilder("Posterior predictive checks (share of sweeps whose"
        + " replicate reaches the observed value; ties count one half)\n");
    for (String[] line : cells) {
      StringBuilder one = new StringBuilder();
      for (int k = 0; k < line.length; k++) {
        String cell = line[k];
        String padded = k < 2 ? cell + " ".repeat(widths[k] - cell.length())
            : " ".repeat(widths[k] - cell.length()) + cell;
        one.append(k == 0 ? "" : "  ").append(padded);
      }
      text.append(one.toString().stripTrailing()).append('\n');
    }
    if (rows.stream().anyMatch(Row::observedVaries)) {
      text.append("* reads unknowns: the mean over sweeps of the observed value\n");
    }
    for (String flag : flags()) {
      text.append("! ").append(flag).append('\n');
    }
    return text.toString();
  }

  /** The report's section: one panel per quantity, grouped by node; nothing when empty. */
  void section(StringBuilder html) {
    if (rows.isEmpty()) {
      return;
    }
    html.append("<section id=\"predictive\"><h2>Posterior predictive checks</h2><p class=\"lead\">")
        .append("Does the fitted model reproduce the data: for each test quantity, the histogram")
        .append(" of its value on data replicated from each kept sweep, and the observed value as")
        .append(" a line. The p-value is the share of sweeps whose replicate reaches the observed")
        .append(" value (ties count one half); below ").append(LOW).append(" or above ")
        .append(HIGH).append(" the model rarely reproduces it. A quantity that reads unknowns")
        .append(" is shown as replicated minus observed, against 0.</p>");
    Map<String, List<Row>> byNode = new LinkedHashMap<>();
    for (Row r : rows) {
      byNode.computeIfAbsent(r.node(), k -> new ArrayList<>()).add(r);
    }
    for (Map.Entry<String, List<Row>> node : byNode.entrySet()) {
      html.append("<section class=\"unknown\"><h3>").append(Markup.escape(node.getKey()))
          .append("</h3><div class=\"pairs\">");
      for (Row r : node.getValue()) {
        html.append("<figure>").append(panel(r)).append("<figcaption>p = ")
            .append(NumberText.fixed(r.pValue(), 3));
        if (!Double.isNaN(r.pValueMcse())) {
          html.append(" (mcse ").append(NumberText.fixed(r.pValueMcse(), 3)).append(')');
        }
        if (!r.words().isEmpty()) {
          html.append(": ").append(Markup.escape(r.words()));
        }
        if (r.replicated().length == 0) {
          html.append(" (no histogram: the run folder has no ").append(SWEEPS_FILE).append(')');
        }
        html.append("</figcaption></figure>");
      }
      html.append("</div></section>\n");
    }
    html.append("</section>\n");
  }

  /** True when the report has a section of checks. */
  boolean hasSection() {
    return !rows.isEmpty();
  }

  private static String panel(Row r) {
    String name = r.fromModelFile() ? r.quantity() : r.quantity().replace('_', ' ');
    if (r.replicated().length == 0) {
      return SvgPlot.note(new PanelLabels("predictive", name, "", ""),
          "observed " + NumberText.significant(r.observed(), 4) + ", replicated mean "
              + NumberText.significant(r.replicatedMean(), 4));
    }
    double[] values = r.observedVaries() ? r.differences() : r.replicated();
    double mark = r.observedVaries() ? 0 : r.observed();
    PanelLabels labels =
        new PanelLabels(
            "predictive", name,
            r.observedVaries() ? "replicated - observed" : "replicated " + name, "sweeps");
    return SvgPlot.replicates(labels, values, mark, BINS);
  }

  /** "none of the 4000 sweeps", "fewer than 0.1% of sweeps" or "only 1.2% of sweeps". */
  private static String share(double share, long sweeps) {
    if (share == 0) {
      return "none of the " + sweeps + " sweeps";
    }
    double p = 100 * share;
    if (p < 0.1) {
      return "fewer than 0.1% of sweeps";
    }
    return "only "
        + (p < 1 ? String.format(Locale.ROOT, "%.1f", p) : String.format(Locale.ROOT, "%.0f", p))
        + "% of sweeps";
  }
}
