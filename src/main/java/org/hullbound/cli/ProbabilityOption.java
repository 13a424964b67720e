package org.hullbound.cli;

import java.io.IOException;
import java.io.StringReader;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.Function;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.app.RunRefusedException;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.TailShare;
import org.hullbound.io.AtomicFiles;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.report.ProbabilityTable;
import picocli.CommandLine.Option;

/**
 * {@code --probability "effect[3] > 0"}: the posterior probability that an unknown lies above or
 * below a value, estimated from the draws with its Monte Carlo standard error ({@link TailShare}),
 * for {@code fit} and {@code summarize} as a picocli mixin.
 *
 * <p>A statement is written as the model language would: a name, optionally indexed by one whole
 * number or a range {@code a..b} (each element its own statement), then {@code >} or {@code <},
 * then a number of the one number grammar ({@link NumberSyntax}), as in {@code effect[1..36] > 0}
 * or {@code sigma < 2.5e-1}. An index list such as {@code X[1,2]} names that one element.
 */
public final class ProbabilityOption {
  /** The file {@code fit} writes the statements' estimates to, in its run folder. */
  public static final String FILE_NAME = "probabilities.csv";

  private static final Pattern STATEMENT =
      Pattern.compile("\\s*([A-Za-z_][A-Za-z0-9_.]*)\\s*(?:\\[([^\\]]*)\\])?"
          + "\\s*([<>])\\s*(\\S+)\\s*");
  private static final Pattern RANGE = Pattern.compile("\\s*(\\d+)\\s*\\.\\.\\s*(\\d+)\\s*");

  @Option(
      names = "--probability",
      paramLabel = "STATEMENT",
      description =
          "The share of draws above or below a value, with its Monte Carlo standard error, e.g."
              + " \"effect[3] > 0\", or \"effect[1..36] > 0\" for each element; repeatable.")
  List<String> statements = new ArrayList<>();

  /** One unknown, one side, one value. */
  record Statement(String unknown, boolean above, double value) {
    String text() {
      return unknown + (above ? " > " : " < ") + NumberSyntax.written(value);
    }
  }

  /** One statement with its estimate. */
  record Estimate(Statement statement, TailShare share) {}

  /** Whether any statement was given. */
  boolean given() {
    return !statements.isEmpty();
  }

  /**
   * The statements, each range expanded, checked against {@code labels} (the unknowns as the
   * draws name them).
   *
   * @throws RunRefusedException (exit 2) naming the statement that is malformed or names no unknown
   */
  List<Statement> expand(List<String> labels) {
    List<Statement> expanded = new ArrayList<>();
    for (String text : statements) {
      Matcher m = STATEMENT.matcher(text);
      if (!m.matches()) {
        throw new RunRefusedException("--probability '" + text + "': expected a statement"
            + " such as \"effect[3] > 0\", \"effect[1..36] > 0\" or \"sigma < 2.5\"");
      }
      double value;
      try {
        value = NumberSyntax.parse(m.group(4));
      } catch (NumberSyntax.InvalidNumberException e) {
        throw new RunRefusedException("--probability '" + text + "': " + e.getMessage()
            + "; " + e.hint());
      }
      boolean above = m.group(3).equals(">");
      List<String> unknowns = new ArrayList<>();
      String index = m.group(2);
      Matcher range = index == null ? null : RANGE.matcher(index);
      if (range != null && range.matches()) {
        long from = Long.parseLong(range.group(1));
        long to = Long.parseLong(range.group(2));
        if (from > to || to - from > 1_000_000) {
          throw new RunRefusedException(
              "--probability '" + text + "': the range " + from + ".." + to
                  + " is empty or too long");
        }
        for (long i = from; i <= to; i++) {
          unknowns.add(m.group(1) + "[" + i + "]");
        }
      } else {
        unknowns.add(m.group(1) + (index == null ? "" : "[" + index.replace(" ", "") + "]"));
      }
      for (String unknown : unknowns) {
        if (!labels.contains(unknown)) {
          throw new RunRefusedException("--probability '" + text + "': there is no unknown "
              + unknown + " among the draws' " + labels.size() + " columns");
        }
        expanded.add(new Statement(unknown, above, value));
      }
    }
    return expanded;
  }

  /** The estimates of {@code statements} from the draws of each unknown ([chain][draw]). */
  static List<Estimate> estimate(List<Statement> statements, Function<String, double[][]> draws) {
    List<Estimate> estimates = new ArrayList<>();
    for (Statement s : statements) {
      estimates.add(new Estimate(
          s, TailShare.of(Draws.of(draws.apply(s.unknown())), s.value(), s.above())));
    }
    return estimates;
  }

  /** The estimates as printed after the summary table. */
  static String text(List<Estimate> estimates) {
    StringBuilder text = new StringBuilder("\nshare of draws beyond a value (+- its MCSE):\n");
    int width = 0;
    for (Estimate e : estimates) {
      width = Math.max(width, e.statement().text().length());
    }
    for (Estimate e : estimates) {
      String statement = e.statement().text();
      text.append("  P(").append(statement).append(')')
          .append(" ".repeat(width - statement.length())).append(" = ")
          .append(String.format(Locale.ROOT, "%.4f", e.share().estimate())).append(" +- ")
          .append(Double.isNaN(e.share().mcse())
              ? "n/a (every draw on one side)"
              : String.format(Locale.ROOT, "%.4f", e.share().mcse()))
          .append('\n');
    }
    return text.toString();
  }

  /** The estimates as {@value #FILE_NAME}: our own column names, one row per statement. */
  static String csv(List<Estimate> estimates) {
    StringBuilder csv = new StringBuilder("unknown,side,value,probability,mcse,indicator_ess\n");
    for (Estimate e : estimates) {
      Statement s = e.statement();
      // RFC 4180: a name with a comma (X[1,2]) is quoted
      csv.append('"').append(s.unknown().replace("\"", "\"\"")).append("\",")
          .append(s.above() ? "above" : "below").append(',')
          .append(NumberSyntax.written(s.value())).append(',')
          .append(e.share().estimate()).append(',')
          .append(written(e.share().mcse())).append(',')
          .append(written(e.share().ess())).append('\n');
    }
    return csv.toString();
  }

  private static String written(double value) {
    return Double.isNaN(value) ? "" : Double.toString(value);
  }

  /** The estimates as the report's table of probability statements. */
  static ProbabilityTable table(List<Estimate> estimates) {
    List<ProbabilityTable.Row> rows = new ArrayList<>();
    for (Estimate e : estimates) {
      rows.add(new ProbabilityTable.Row(
          e.statement().text(), e.share().estimate(), e.share().mcse()));
    }
    return ProbabilityTable.of(rows);
  }

  /**
   * The table of a {@value #FILE_NAME} that {@link #csv} wrote, read back for a page drawn again
   * from a run folder.
   *
   * @throws IllegalArgumentException when {@code text} is not such a file
   */
  static ProbabilityTable fromCsv(String text) {
    List<ProbabilityTable.Row> rows = new ArrayList<>();
    try {
      for (CSVRecord r : CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get()
          .parse(new StringReader(text)).getRecords()) {
        Statement statement =
            new Statement(r.get("unknown"), r.get("side").equals("above"),
                NumberSyntax.parse(r.get("value")));
        String mcse = r.get("mcse");
        rows.add(new ProbabilityTable.Row(
            statement.text(), Double.parseDouble(r.get("probability")),
            mcse.isEmpty() ? Double.NaN : Double.parseDouble(mcse)));
      }
    } catch (IOException | RuntimeException bad) {
      throw new IllegalArgumentException(
          "not a table of probability statements: " + bad.getMessage(), bad);
    }
    return ProbabilityTable.of(rows);
  }

  /** Writes {@link #csv} to {@value #FILE_NAME} in {@code folder}; returns the file. */
  static Path write(Path folder, List<Estimate> estimates) {
    Path file = folder.resolve(FILE_NAME);
    AtomicFiles.write(file, csv(estimates));
    return file;
  }
}
