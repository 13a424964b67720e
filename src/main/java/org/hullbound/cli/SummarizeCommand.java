package org.hullbound.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.io.AtomicFiles;
import org.hullbound.io.DrawsReader;
import org.hullbound.io.DrawsTable;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.report.SummaryTable;
import org.hullbound.report.Verdicts;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code hullbound summarize DRAWS.csv}: the posterior summary table and plain-language verdicts
 * of a draws file, the same report as {@code fit} prints, without the update columns (a file does
 * not say how its draws were made).
 *
 * <p>Thin by design: {@link DrawsReader} reads and checks the file, {@code diagnostics} and {@code
 * report} compute and render; this class picks the columns, writes the optional CSV atomically
 * and turns failures into exit codes (0 done, 2 a bad file or option, with the message on
 * standard error).
 */
@Command(
    name = "summarize",
    mixinStandardHelpOptions = true,
    sortOptions = false,
    description =
        "Summarise a draws file: posterior mean, sd, quantiles, R-hat, effective sample "
        + "sizes and Monte Carlo error per variable, then plain-language verdicts on "
        + "convergence.")
public final class SummarizeCommand implements Callable<Integer> {

  @Parameters(
      index = "0",
      paramLabel = "DRAWS.csv",
      description =
        "A draws CSV with a header row: fit's draws.csv (chain, draw, then the "
        + "unknowns), or any CSV of variables with an optional 'chain' and an optional "
        + "'draw' or 'iteration' column.")
  Path drawsFile;

  @Option(
      names = "--csv",
      paramLabel = "FILE",
      description = "Also write the summary table as CSV to FILE (full precision).")
  Path csvFile;

  @Option(
      names = "--columns",
      paramLabel = "NAME",
      split = ",",
      description = "Summarise only these variables, in this order (comma-separated).")
  List<String> columns;

  @Option(
      names = "--max-rhat",
      paramLabel = "R",
      description = "Flag an R-hat above R (default: ${DEFAULT-VALUE}).")
  double maxRhat = Verdicts.DEFAULT_MAX_RHAT;

  @Option(
      names = "--min-ess",
      paramLabel = "N",
      description =
          "Flag a bulk or tail effective sample size below N (default: ${DEFAULT-VALUE}).")
  double minEss = Verdicts.DEFAULT_MIN_ESS;

  @CommandLine.Mixin LevelOption level;

  @CommandLine.Mixin ProbabilityOption probability;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    String problem = checkOptions();
    if (problem != null) {
      return userError(stderr, problem);
    }
    DrawsTable draws = DrawsReader.read(drawsFile);
    List<String> chosen;
    if (columns == null) {
      chosen = draws.variables();
    } else {
      chosen = new ArrayList<>();
      Set<String> distinct = new LinkedHashSet<>();
      for (String column : columns) {
        String name = column.strip();
        if (!draws.hasVariable(name)) {
          String hint = NameSuggestion.hint(name, draws.variables());
          return userError(stderr, "--columns: '" + name + "' is not a variable of " + drawsFile
              + (hint == null ? "" : " (" + hint + ")") + "; its variables are "
              + shortList(draws.variables()));
        }
        if (distinct.add(name)) {
          chosen.add(name);
        }
      }
    }
    List<ProbabilityOption.Statement> statements = probability.expand(draws.variables());
    for (String note : draws.notes()) {
      stderr.println("hullbound summarize: note: " + note);
    }
    stderr.flush();
    List<VariableSummary> summaries = new ArrayList<>();
    List<Draws> kept = new ArrayList<>();
    Map<String, Draws> keptByName = new HashMap<>();
    for (String name : chosen) {
      Draws d = Draws.of(draws.draws(name));
      kept.add(d);
      keptByName.put(name, d);
      summaries.add(PosteriorSummary.of(name, d));
    }
    SummaryTable table = SummaryTable.of(summaries).withIntervalLevel(level.value(), kept);
    if (csvFile != null) {
      AtomicFiles.write(csvFile, table.csv());
    }
    stdout.print(table.text(maxRhat, minEss));
    stdout.println();
    for (String line : Verdicts.of(table, maxRhat, minEss)
        .withLabelSwitchingFoundInDraws(chosen, keptByName).lines()) {
      stdout.println(line);
    }
    if (!statements.isEmpty()) {
      stdout.print(ProbabilityOption.text(ProbabilityOption.estimate(statements, draws::draws)));
    }
    if (csvFile != null) {
      stdout.println();
      stdout.println("summary: " + csvFile);
    }
    stdout.flush();
    return 0;
  }

  private String checkOptions() {
    if (!(maxRhat > 1) || Double.isInfinite(maxRhat)) {
      return "--max-rhat must be a finite number above 1, got " + NumberSyntax.written(maxRhat);
    }
    if (!(minEss > 0) || Double.isInfinite(minEss)) {
      return "--min-ess must be a finite number above 0, got " + NumberSyntax.written(minEss);
    }
    if (level.problem() != null) {
      return level.problem();
    }
    if (columns != null && columns.stream().allMatch(c -> c.isBlank())) {
      return "--columns needs at least one variable name";
    }
    if (columns != null && columns.stream().anyMatch(String::isBlank)) {
      return "--columns has an empty name; separate names by single commas, e.g. --columns mu,tau";
    }
    return null;
  }

  private static int userError(PrintWriter stderr, String problem) {
    stderr.println("hullbound summarize: " + problem);
    stderr.flush();
    return ErrorReporting.USER_ERROR;
  }

  private static String shortList(List<String> names) {
    int shown = Math.min(names.size(), 12);
    String list = String.join(", ", names.subList(0, shown));
    return names.size() > shown ? list + ", ... (" + names.size() + " in all)" : list;
  }
}
